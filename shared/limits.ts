/** Sizes the server enforces and the client checks before sending (one number each). */

/** The largest JSON body a route accepts unless it says otherwise: 256 KB. */
export const JSON_BODY_LIMIT = 256 * 1024
