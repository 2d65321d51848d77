/** The Site check: a practitioner's plan of a bank before the site visit. Pure: no Vue, no Nitro. */
export * from './inputs'
export * from './plan'
export * from './warnings'
export { benchDocument } from './build'
export * from './sizes'
export * from './sheet'
export { drawBank, type BankDrawing } from './drawing'
