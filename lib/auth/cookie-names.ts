/** Cookies of the company sign-in round trip (the session cookie's name is lucia's). */
export const SSO_COOKIE = 'lagwise_sso';
export const LINK_COOKIE = 'lagwise_link';
export const SSO_MESSAGE_COOKIE = 'lagwise_sso_msg';
