// Requests the fetch API cannot make: a body streamed in chunks (or with a declared length)
// that stops being sent as soon as the server answers, so a 600 MB body is never built.
import { request } from 'node:http'
import { readFileSync } from 'node:fs'

export interface StreamedAnswer {
  status: number
  headers: Record<string, string | string[] | undefined>
  text: string
  body: any
  /** bytes of the body written before the answer came */
  sent: number
}

export interface StreamOptions {
  method?: string
  headers?: Record<string, string>
  /** the body's bytes in all; chunks of `chunk` are sent until the server answers */
  bytes: number
  /** what each chunk holds (64 KB of `x` unless given) */
  chunk?: Buffer
  /** send a Content-Length of `bytes` instead of chunked encoding */
  declareLength?: boolean
  /** the first bytes of the body (a JSON opening, multipart headers), then the chunks */
  head?: Buffer
  /** the last bytes of the body (a multipart closing) */
  tail?: Buffer
}

/** Streams a body to `url` and resolves with the answer, which may come before the body is all sent. */
export function streamBody(url: string, { method = 'POST', headers = {}, bytes, chunk = Buffer.alloc(64 * 1024, 'x'), declareLength = false, head = Buffer.alloc(0), tail = Buffer.alloc(0) }: StreamOptions): Promise<StreamedAnswer> {
  return new Promise((resolve, reject) => {
    let answered = false
    let sent = 0
    const req = request(url, { method, headers: { ...headers, ...(declareLength ? { 'content-length': String(bytes) } : { 'transfer-encoding': 'chunked' }) } })
    req.on('response', (res) => {
      answered = true
      const parts: Buffer[] = []
      res.on('data', (part: Buffer) => parts.push(part))
      res.on('end', () => {
        const text = Buffer.concat(parts).toString('utf8')
        let body: any = text
        try {
          body = JSON.parse(text)
        }
        catch { /* not JSON */ }
        resolve({ status: res.statusCode ?? 0, headers: res.headers, text, body, sent })
        req.destroy()
      })
      res.on('error', reject)
    })
    // once answered, the server may close the connection under a body still being written
    req.on('error', (error) => {
      if (!answered) reject(error)
    })
    const middle = bytes - head.length - tail.length
    const write = async () => {
      let left = middle
      const waitDrain = () => new Promise<void>(done => req.once('drain', () => done()))
      if (!req.write(head)) await waitDrain()
      sent += head.length
      while (left > 0 && !answered && !req.destroyed) {
        const piece = left >= chunk.length ? chunk : chunk.subarray(0, left)
        left -= piece.length
        sent += piece.length
        // a write after the server closed only fails the socket, which the answer already beat
        if (!req.write(piece)) {
          await Promise.race([waitDrain(), new Promise(done => req.once('close', done)), new Promise(done => req.once('response', done))])
        }
      }
      if (!answered && !req.destroyed) {
        req.write(tail)
        sent += tail.length
        req.end()
      }
    }
    write().catch(reject)
  })
}

/** The resident memory of a process in bytes (VmRSS in /proc/PID/status). */
export function residentBytes(pid: number): number {
  const line = readFileSync(`/proc/${pid}/status`, 'utf8').split('\n').find(l => l.startsWith('VmRSS:'))!
  return Number(/(\d+)/.exec(line)![1]) * 1024
}

/** A multipart/form-data body holding a caption and a file field "photo", in three parts around the file's bytes. */
export function multipartAround(filename: string, type: string, caption = '') {
  const boundary = `----phaseloom-${Date.now()}`
  const head = Buffer.from(`--${boundary}\r\ncontent-disposition: form-data; name="caption"\r\n\r\n${caption}\r\n--${boundary}\r\ncontent-disposition: form-data; name="photo"; filename="${filename}"\r\ncontent-type: ${type}\r\n\r\n`)
  const tail = Buffer.from(`\r\n--${boundary}--\r\n`)
  return { head, tail, contentType: `multipart/form-data; boundary=${boundary}` }
}
