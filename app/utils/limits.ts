/** The largest JSON body the API takes (server/utils/body.ts): 256 KB. */
export const JSON_LIMIT_BYTES = 256 * 1024
