/**
 * Regional conductor colour conventions, as data. The user picks one in their settings;
 * energized jumpers on the Bench are tinted with it. `screen` is the colour drawn on the
 * paper canvas; `conductor` is what the insulation is called on site. Colour is never the
 * only signal: every jumper also carries its phase label.
 */
export interface PhaseColour {
  label: string
  conductor: string
  screen: string
}

export interface PhaseColourSet {
  id: string
  name: string
  note: string
  phases: { A: PhaseColour, B: PhaseColour, C: PhaseColour }
  neutral: PhaseColour
  ground: PhaseColour
  /** Marking for the high leg of a four-wire delta, where the convention has one. */
  highLeg?: PhaseColour
}

export const phaseColourSets: readonly PhaseColourSet[] = [
  {
    id: 'na-120-240',
    name: 'North America (common, 120/208 V and 120/240 V)',
    note: 'Customary, not mandated by the NEC except the high leg, which NEC 110.15 requires marked orange.',
    phases: {
      A: { label: 'A', conductor: 'black', screen: '#1f2328' },
      B: { label: 'B', conductor: 'red', screen: '#c62828' },
      C: { label: 'C', conductor: 'blue', screen: '#1f5fbf' },
    },
    neutral: { label: 'N', conductor: 'white', screen: '#8a8f98' },
    ground: { label: 'G', conductor: 'green', screen: '#2e7d32' },
    highLeg: { label: 'B (high leg)', conductor: 'orange', screen: '#e07a00' },
  },
  {
    id: 'na-277-480',
    name: 'North America (common, 277/480 V)',
    note: 'Customary brown, orange, yellow with grey neutral.',
    phases: {
      A: { label: 'A', conductor: 'brown', screen: '#7b4a26' },
      B: { label: 'B', conductor: 'orange', screen: '#e07a00' },
      C: { label: 'C', conductor: 'yellow', screen: '#b89300' },
    },
    neutral: { label: 'N', conductor: 'grey', screen: '#6b7079' },
    ground: { label: 'G', conductor: 'green', screen: '#2e7d32' },
  },
  {
    id: 'iec-harmonised',
    name: 'IEC 60446 / EU harmonised',
    note: 'Brown, black, grey with blue neutral and green-and-yellow protective earth.',
    phases: {
      A: { label: 'L1', conductor: 'brown', screen: '#7b4a26' },
      B: { label: 'L2', conductor: 'black', screen: '#1f2328' },
      C: { label: 'L3', conductor: 'grey', screen: '#6b7079' },
    },
    neutral: { label: 'N', conductor: 'blue', screen: '#1f5fbf' },
    ground: { label: 'PE', conductor: 'green-and-yellow', screen: '#4f8a1d' },
  },
  {
    id: 'uk-legacy',
    name: 'United Kingdom (before 2004)',
    note: 'Found in older installations: red, yellow, blue with black neutral.',
    phases: {
      A: { label: 'L1', conductor: 'red', screen: '#c62828' },
      B: { label: 'L2', conductor: 'yellow', screen: '#b89300' },
      C: { label: 'L3', conductor: 'blue', screen: '#1f5fbf' },
    },
    neutral: { label: 'N', conductor: 'black', screen: '#1f2328' },
    ground: { label: 'E', conductor: 'green-and-yellow', screen: '#4f8a1d' },
  },
  {
    id: 'au-nz',
    name: 'Australia and New Zealand (common)',
    note: 'Red, white, blue with black neutral and green-and-yellow earth.',
    phases: {
      A: { label: 'A', conductor: 'red', screen: '#c62828' },
      B: { label: 'B', conductor: 'white', screen: '#8a8f98' },
      C: { label: 'C', conductor: 'blue', screen: '#1f5fbf' },
    },
    neutral: { label: 'N', conductor: 'black', screen: '#1f2328' },
    ground: { label: 'E', conductor: 'green-and-yellow', screen: '#4f8a1d' },
  },
]

export const defaultPhaseColourSetId = 'na-120-240'

export function phaseColourSet(id: string): PhaseColourSet {
  return phaseColourSets.find(set => set.id === id)
    ?? phaseColourSets.find(set => set.id === defaultPhaseColourSetId)!
}
