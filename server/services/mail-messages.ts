/** The words of the messages Phaseloom sends. Plain text first, with a simple HTML twin. */
import type { Mail } from '../utils/mail'

function html(paragraphs: string[], link: { href: string, label: string }): string {
  const body = paragraphs.map(p => `<p>${escapeHtml(p)}</p>`).join('\n')
  return `<!doctype html>
<html><body style="font-family: 'IBM Plex Sans', system-ui, sans-serif; color: #26303b; background: #f7f2e8; padding: 24px;">
<div style="max-width: 560px; margin: 0 auto; background: #fffcf5; border: 1px solid #e4dccb; padding: 24px;">
<p style="font-weight: 600; font-size: 18px;">Phaseloom</p>
${body}
<p><a href="${escapeHtml(link.href)}" style="color: #8a4a29; font-weight: 600;">${escapeHtml(link.label)}</a></p>
<p style="font-size: 12px; color: #4a5562;">Phaseloom is a practice and planning tool. Real banks can kill: de-energize, lock out and verify absence of voltage before touching.</p>
</div></body></html>`
}

export function passwordResetMail(to: string, name: string, link: string): Mail {
  const paragraphs = [
    `Hello ${name},`,
    'Someone (we hope you) asked to set a new password for your Phaseloom account. The link below lets you choose one. It works once, for one hour.',
    'If you did not ask for this, ignore this message: your password stays as it is.',
  ]
  return {
    to,
    subject: 'Set a new Phaseloom password',
    text: `${paragraphs.join('\n\n')}\n\nChoose a new password: ${link}\n\n-- Phaseloom\n`,
    html: html(paragraphs, { href: link, label: 'Choose a new password' }),
  }
}

export function instructorInvitationMail(to: string, name: string | null, invitedBy: string, link: string): Mail {
  const paragraphs = [
    name ? `Hello ${name},` : 'Hello,',
    `${invitedBy} has invited you to teach on Phaseloom as an instructor: you will be able to run classes, publish fault hunts and review lab sheets.`,
    'Open the link below to accept. If you already have a Phaseloom account with this e-mail address, sign in first and your account becomes an instructor account. The invitation is good for 7 days.',
  ]
  return {
    to,
    subject: 'You are invited to teach on Phaseloom',
    text: `${paragraphs.join('\n\n')}\n\nAccept the invitation: ${link}\n\n-- Phaseloom\n`,
    html: html(paragraphs, { href: link, label: 'Accept the invitation' }),
  }
}

export function classInvitationMail(to: string, instructor: string, className: string, link: string, days: number): Mail {
  const paragraphs = [
    'Hello,',
    `${instructor} has invited you to join the class "${className}" on Phaseloom, where you will find the fault hunts published to it.`,
    `Open the link below and sign in (or make a student account with this e-mail address first). The link works once, for ${days} days.`,
  ]
  return {
    to,
    subject: `Join ${className} on Phaseloom`,
    text: `${paragraphs.join('\n\n')}\n\nJoin the class: ${link}\n\n-- Phaseloom\n`,
    html: html(paragraphs, { href: link, label: 'Join the class' }),
  }
}

export function huntPublishedMail(to: string, name: string, instructor: string, title: string, className: string, dueAt: Date | null, link: string): Mail {
  const paragraphs = [
    `Hello ${name},`,
    `${instructor} has published a fault hunt, "${title}", to ${className}.${dueAt ? ` It is due ${dueAt.toUTCString()}.` : ''}`,
    'Find the fault with the meter, as on a real bench, and do not close a delta onto it. Readings come from Phaseloom; your instructor sees how many probes you took.',
  ]
  return {
    to,
    subject: `New fault hunt: ${title}`,
    text: `${paragraphs.join('\n\n')}\n\nOpen the hunt: ${link}\n\n-- Phaseloom\n`,
    html: html(paragraphs, { href: link, label: 'Open the hunt' }),
  }
}

export function labSheetReviewedMail(to: string, name: string, title: string, verdict: 'accepted' | 'redo', comment: string, link: string): Mail {
  const paragraphs = [
    `Hello ${name},`,
    verdict === 'accepted' ? `Your lab sheet "${title}" was accepted.` : `Your lab sheet "${title}" was sent back to redo.`,
    ...(comment ? [`Your instructor wrote: ${comment}`] : []),
  ]
  return {
    to,
    subject: verdict === 'accepted' ? `Lab sheet accepted: ${title}` : `Lab sheet to redo: ${title}`,
    text: `${paragraphs.join('\n\n')}\n\nOpen the sheet: ${link}\n\n-- Phaseloom\n`,
    html: html(paragraphs, { href: link, label: 'Open the sheet' }),
  }
}

export function signUpConfirmMail(to: string, name: string, link: string, hours: number): Mail {
  const paragraphs = [
    `Hello ${name},`,
    `Open the link below to finish making your Phaseloom account with this address. It works once, for ${hours} hours.`,
    'If you did not ask for an account, ignore this message: nothing is made without the link.',
  ]
  return {
    to,
    subject: 'Finish making your Phaseloom account',
    text: `${paragraphs.join('\n\n')}\n\nFinish making the account: ${link}\n\n-- Phaseloom\n`,
    html: html(paragraphs, { href: link, label: 'Finish making the account' }),
  }
}

export function signUpTakenMail(to: string, signInLink: string, forgotLink: string): Mail {
  const paragraphs = [
    'Hello,',
    'Someone tried to make a Phaseloom account with this address. If it was you, sign in or reset your password; if not, ignore this.',
    'Your account stays as it is: no new account was made.',
  ]
  return {
    to,
    subject: 'Someone tried to make a Phaseloom account with your address',
    text: `${paragraphs.join('\n\n')}\n\nSign in: ${signInLink}\nReset your password: ${forgotLink}\n\n-- Phaseloom\n`,
    html: html(paragraphs, { href: signInLink, label: 'Sign in' }),
  }
}
