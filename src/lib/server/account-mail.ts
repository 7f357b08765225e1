// The account messages: sign-up verification, "you already have an account", password reset
// and invitation. Each is plain text with an HTML alternative.
import type { OutgoingMail } from './mail';
import { mailHtml, mailText, type MailBlock } from './mail-layout';
import { TOKEN_LIFETIME_MIN } from '../domain/account-tokens';
import { ROLE_LABELS, type Role } from '../domain/roles';

function compose(to: string, subject: string, greeting: string, blocks: MailBlock[]): OutgoingMail {
  return { to, subject, text: mailText(greeting, blocks), html: mailHtml(greeting, blocks) };
}

const hours = (min: number) => (min >= 120 ? `${Math.round(min / 60)} hours` : min === 60 ? 'one hour' : `${min} minutes`);
const days = (min: number) => `${Math.round(min / 1440)} days`;

export function signupMail(to: string, name: string, link: string): OutgoingMail {
  return compose(to, 'Confirm your e-mail for Bearline', `Hello ${name},`, [
    {
      kind: 'p',
      text: 'Thank you for offering to report masts for Bearline. Please confirm that this address is yours, and your contributor account will be ready.',
    },
    { kind: 'button', text: 'Confirm my e-mail', href: link },
    {
      kind: 'small',
      text: `The link works once, for ${hours(TOKEN_LIFETIME_MIN.signup)}. If you did not sign up, ignore this message: no account is made without the link.`,
    },
  ]);
}

export function existingAccountMail(to: string, name: string, signInLink: string, forgotLink: string): OutgoingMail {
  return compose(to, 'You already have a Bearline account', `Hello ${name},`, [
    {
      kind: 'p',
      text: 'Someone, probably you, tried to sign up for Bearline with this e-mail address. An account with this address already exists, so nothing new was made.',
    },
    { kind: 'button', text: 'Sign in', href: signInLink },
    { kind: 'p', text: `Forgotten your password? Ask for a new one here: ${forgotLink}` },
    { kind: 'small', text: 'If it was not you, you need not do anything.' },
  ]);
}

export function resetMail(to: string, name: string, link: string): OutgoingMail {
  return compose(to, 'Choose a new Bearline password', `Hello ${name},`, [
    { kind: 'p', text: 'We were asked to reset the password of your Bearline account. Follow the link to choose a new one.' },
    { kind: 'button', text: 'Choose a new password', href: link },
    {
      kind: 'small',
      text: `The link works once, for ${hours(TOKEN_LIFETIME_MIN.reset)}. Setting a new password signs you out everywhere else. If you did not ask for this, ignore this message: your password stays as it is.`,
    },
  ]);
}

export function inviteMail(to: string, name: string, role: Role, invitedBy: string, link: string): OutgoingMail {
  return compose(to, 'You are invited to Bearline', `Hello ${name},`, [
    { kind: 'p', text: `${invitedBy} has made you a Bearline account as ${ROLE_LABELS[role].toLowerCase()}. Choose your password to start.` },
    { kind: 'button', text: 'Choose my password', href: link },
    { kind: 'small', text: `The link works once, for ${days(TOKEN_LIFETIME_MIN.invite)}. If it expires, ask ${invitedBy} to send a new invitation.` },
  ]);
}
