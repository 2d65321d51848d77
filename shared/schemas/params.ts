/** Route parameters shared by the routes that take them. */
import { z } from 'zod'
import { idParam, linkToken } from './ids'

export const idParams = z.object({ id: idParam('id') })
export const tokenParams = z.object({ token: linkToken })
