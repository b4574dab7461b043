/**
 * Mail domains anyone can get an address at. No organization may claim one for company sign-in:
 * proving control of such a domain is not possible for a customer, and a claim would send every
 * user of the provider to the claimer's sign-in page. A kept list — add to it when a provider is
 * missing (subdomains of a listed domain are refused too).
 */
export const PUBLIC_MAIL_DOMAINS: ReadonlySet<string> = new Set([
  'gmail.com', 'googlemail.com', 'google.com',
  'outlook.com', 'hotmail.com', 'hotmail.co.uk', 'hotmail.fr', 'hotmail.de', 'live.com', 'live.co.uk', 'msn.com', 'passport.com', 'microsoft.com', 'windowslive.com',
  'yahoo.com', 'yahoo.co.uk', 'yahoo.fr', 'yahoo.de', 'yahoo.co.jp', 'ymail.com', 'rocketmail.com',
  'aol.com', 'aim.com', 'icloud.com', 'me.com', 'mac.com',
  'proton.me', 'protonmail.com', 'protonmail.ch', 'pm.me', 'tutanota.com', 'tuta.io', 'tutamail.com',
  'gmx.com', 'gmx.net', 'gmx.de', 'web.de', 'mail.com', 'email.com', 'zoho.com', 'zohomail.com', 'yandex.com', 'yandex.ru', 'ya.ru',
  'mail.ru', 'inbox.ru', 'bk.ru', 'list.ru', 'rambler.ru', 'qq.com', '163.com', '126.com', 'yeah.net', 'sina.com', 'sohu.com', 'naver.com', 'daum.net', 'hanmail.net',
  'fastmail.com', 'fastmail.fm', 'hey.com', 'hushmail.com', 'mailbox.org', 'posteo.de', 'posteo.net', 'runbox.com', 'disroot.org', 'riseup.net',
  'orange.fr', 'wanadoo.fr', 'free.fr', 'laposte.net', 'sfr.fr', 't-online.de', 'freenet.de', 'libero.it', 'virgilio.it', 'tiscali.it',
  'btinternet.com', 'sky.com', 'virginmedia.com', 'comcast.net', 'verizon.net', 'att.net', 'sbcglobal.net', 'cox.net', 'charter.net', 'earthlink.net',
  'rediffmail.com', 'seznam.cz', 'wp.pl', 'o2.pl', 'interia.pl', 'onet.pl', 'ziggo.nl', 'kpnmail.nl', 'telenet.be', 'bluewin.ch', 'gmx.ch', 'gmx.at',
  'guerrillamail.com', 'mailinator.com', 'yopmail.com', '10minutemail.com', 'temp-mail.org', 'sharklasers.com', 'trashmail.com',
]);

/** Whether a domain (or a parent of it) is a public mail provider's. */
export function isPublicMailDomain(domain: string): boolean {
  const parts = domain.toLowerCase().replace(/\.$/, '').split('.');
  for (let i = 0; i < parts.length - 1; i++) if (PUBLIC_MAIL_DOMAINS.has(parts.slice(i).join('.'))) return true;
  return false;
}

/**
 * The administrative mailboxes a domain proof may be sent to — the addresses certificate authorities
 * accept for domain validation (CA/Browser Forum Baseline Requirements 3.2.2.4.4): only a domain's
 * administrators can normally read them.
 */
export const ADMIN_MAILBOXES = ['admin', 'administrator', 'hostmaster', 'postmaster', 'webmaster'] as const;
export type AdminMailbox = (typeof ADMIN_MAILBOXES)[number];
