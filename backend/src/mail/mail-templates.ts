/**
 * The e-mails Ampwright sends, each in plain text and HTML, each naming the firm. Values are escaped
 * for HTML; links are built by the caller from the configured APP_URL.
 */
import type { OutgoingMail } from './mail.service';

const escape = (s: string) => s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);

function compose(to: string, subject: string, firm: string, paragraphs: string[], action?: { label: string; url: string }): OutgoingMail {
  const text = [...paragraphs, ...(action ? [`${action.label}: ${action.url}`] : []), '', `— Ampwright, for ${firm}`].join('\n\n');
  const html = [
    '<div style="font-family:IBM Plex Sans,Arial,sans-serif;color:#1c2328;max-width:560px">',
    ...paragraphs.map((p) => `<p>${escape(p)}</p>`),
    action
      ? `<p><a href="${escape(action.url)}" style="background:#16324a;color:#fff;padding:8px 14px;text-decoration:none">${escape(action.label)}</a></p>`
      : '',
    `<p style="color:#4f5a62;font-size:12px">Ampwright, for ${escape(firm)}</p>`,
    '</div>',
  ].join('');
  return { to, subject, text, html };
}

export const mailTemplates = {
  invitation: (p: { to: string; firm: string; invitedBy: string; roles: string[]; url: string; expires: Date }) =>
    compose(
      p.to,
      `${p.firm} invites you to Ampwright`,
      p.firm,
      [
        `${p.invitedBy} has invited you to join ${p.firm} on Ampwright as ${p.roles.join(', ')}.`,
        `The invitation is valid until ${p.expires.toUTCString()}. If you did not expect it, ignore this message.`,
      ],
      { label: 'Accept the invitation', url: p.url },
    ),
  passwordReset: (p: { to: string; firm: string; url: string; expires: Date }) =>
    compose(
      p.to,
      'Reset your Ampwright password',
      p.firm,
      [
        'Someone asked to reset the password of this Ampwright account. The link works once.',
        `It is valid until ${p.expires.toUTCString()}. If you did not ask, ignore this message: your password stays as it is.`,
      ],
      { label: 'Choose a new password', url: p.url },
    ),
  /** The link that makes a registered firm (registration answers the same for every address). */
  confirmRegistration: (p: { to: string; firm: string; url: string; expires: Date }) =>
    compose(
      p.to,
      'Confirm your Ampwright registration',
      p.firm,
      [
        `Someone registered the firm ${p.firm} on Ampwright with this address. Follow the link to confirm it and sign in; it works once.`,
        `It is valid until ${p.expires.toUTCString()}. If you did not register, ignore this message: nothing is made.`,
      ],
      { label: 'Confirm and sign in', url: p.url },
    ),
  /** Registration with an address that has an account already: said to the address, never to the requester. */
  alreadyRegistered: (p: { to: string; url: string }) =>
    compose(
      p.to,
      'Your Ampwright account',
      'Ampwright',
      [
        'Someone tried to register a firm on Ampwright with this address, which has an account already. Sign in instead; if you forgot the password, the sign-in page can reset it. If it was not you, ignore this message.',
      ],
      { label: 'Sign in', url: p.url },
    ),
  /** A sheet's review event, to one person: what happened, in one sentence, with a link to the sheet. */
  sheetEvent: (p: { to: string; firm: string; subject: string; sentence: string; url: string; action?: string }) =>
    compose(p.to, p.subject, p.firm, [p.sentence], { label: p.action ?? 'Open the sheet', url: p.url }),
  revisionIssued: (p: { to: string; firm: string; sheet: string; revision: string; url: string }) =>
    compose(p.to, `Issued: ${p.sheet}, revision ${p.revision}`, p.firm, [`${p.firm} has issued revision ${p.revision} of "${p.sheet}".`], {
      label: 'Open the client portal',
      url: p.url,
    }),
};
