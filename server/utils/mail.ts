import nodemailer, { type Transporter } from 'nodemailer'

let transport: Transporter | undefined

export interface Mail {
  to: string
  subject: string
  text: string
  html: string
}

/**
 * Sends a message over SMTP (runtime config `mail`: host, port, secure, user, password, from).
 * In development and tests the host is the local mail catcher that `npm start` and `npm test`
 * run (scripts/mail-catcher.mjs).
 */
export async function sendMail(mail: Mail): Promise<void> {
  const config = useRuntimeConfig().mail
  if (!config.host) throw new Error('mail is not set up: set NUXT_MAIL_HOST (and NUXT_MAIL_PORT, NUXT_MAIL_USER, NUXT_MAIL_PASSWORD)')
  transport ??= nodemailer.createTransport({
    host: config.host,
    port: Number(config.port),
    secure: String(config.secure) === 'true',
    auth: config.user ? { user: config.user, pass: config.password } : undefined,
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 20_000,
  })
  await transport.sendMail({ from: config.from, ...mail })
}

/** Escapes text for the HTML part of a message. */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, c => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', '\'': '&#39;' })[c]!)
}
