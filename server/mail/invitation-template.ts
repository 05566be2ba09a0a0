// The invitation e-mail: a set-password link for a person an admin has added to the portal.
// Same layout and colours as the quote mails (templates.ts), with its own words.
import type { OutgoingMail } from './outbox'
import { escapeHtml, formatInstant } from './templates'

export interface InvitationMailData {
  /** Base address of the portal (portalUrlFrom). */
  portalUrl: string
  /** The raw token; only its hash is stored, so this mail is the one place the link exists. */
  token: string
  invitee: { name: string; email: string }
  invitedBy: { name: string; email: string }
  organisationName: string
  role: 'admin' | 'sales' | 'buyer'
  expiresAt: Date
  userId: string
  makerName?: string
}

const TEAL = '#0f5c5a'
const COPPER = '#b5653a'
const ROLE_WORDS: Record<InvitationMailData['role'], string> = {
  buyer: 'a buyer: run duty studies, request and accept quotes, pay deposits',
  sales: 'a sales engineer: build, revise and issue quotes for your accounts',
  admin: 'an administrator: catalogue, prices, people and the audit log',
}

export function invitationLink(portalUrl: string, token: string): string {
  return `${portalUrl.replace(/\/+$/, '')}/set-password/${encodeURIComponent(token)}`
}

/** Sent when an admin invites someone, and again (with a fresh link) when they resend it. */
export function invitationMail(data: InvitationMailData): OutgoingMail {
  const maker = data.makerName ?? 'Ashcombe Motor Works'
  const link = invitationLink(data.portalUrl, data.token)
  const expires = formatInstant(data.expiresAt)
  const paragraphs = [
    `${data.invitedBy.name} has given you an account on Spinwright, the portal of ${maker}, for ${data.organisationName}.`,
    `You will sign in as ${ROLE_WORDS[data.role]}.`,
    `Choose your password with the link below (at least 12 characters). The link works once and ends on ${expires}; after that, ask ${data.invitedBy.name} (${data.invitedBy.email}) for a new one.`,
  ]
  const text = [
    `Hello ${data.invitee.name},`,
    '',
    ...paragraphs.flatMap((paragraph) => [paragraph, '']),
    `Your sign-in e-mail: ${data.invitee.email}`,
    '',
    `Set your password: ${link}`,
    '',
    'If you did not expect this message, ignore it: nothing happens until the link is used.',
    '',
    '-- ',
    `Spinwright, the portal of ${maker}`,
    'This message was sent automatically.',
    '',
  ].join('\n')
  const html = [
    '<!doctype html>',
    `<html lang="en"><head><meta charset="utf-8"><title>Your Spinwright account</title></head>`,
    '<body style="margin:0;padding:0;background:#f4f6f6;font-family:Roboto,Arial,sans-serif;color:#1d2525">',
    '<div style="max-width:600px;margin:0 auto;padding:24px">',
    `<div style="border-top:4px solid ${TEAL};background:#ffffff;padding:24px">`,
    `<p style="margin:0 0 16px;font-size:13px;letter-spacing:0.04em;color:${TEAL};font-weight:700">SPINWRIGHT &middot; ${escapeHtml(maker.toUpperCase())}</p>`,
    `<p>Hello ${escapeHtml(data.invitee.name)},</p>`,
    ...paragraphs.map((paragraph) => `<p style="line-height:1.5">${escapeHtml(paragraph)}</p>`),
    `<p style="line-height:1.5">Your sign-in e-mail: <strong>${escapeHtml(data.invitee.email)}</strong></p>`,
    `<p style="margin:24px 0"><a href="${escapeHtml(link)}" style="background:${TEAL};color:#ffffff;padding:10px 18px;text-decoration:none;border-radius:4px">Set your password</a></p>`,
    `<p style="font-size:13px;color:#555">Or copy this address: ${escapeHtml(link)}</p>`,
    '<p style="line-height:1.5">If you did not expect this message, ignore it: nothing happens until the link is used.</p>',
    '</div>',
    `<p style="font-size:12px;color:#6b7575;border-top:1px solid ${COPPER};padding-top:8px">Spinwright, the portal of ${escapeHtml(maker)}. This message was sent automatically.</p>`,
    '</div></body></html>',
  ].join('\n')
  return {
    kind: 'user-invitation',
    reference: data.userId,
    to: [data.invitee.email],
    subject: `Your Spinwright account at ${maker}`,
    text,
    html,
  }
}
