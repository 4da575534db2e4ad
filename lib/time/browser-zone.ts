/**
 * Until a member chooses a time zone, pages use the one their browser reports, carried in this
 * cookie. A cookie rather than saving the browser's zone on the member: the server reads it with
 * the request, so the first render is already in the right zone; it needs no write and no server
 * action; and it follows the browser (a laptop taken to another farm, a shared office computer)
 * while the member has chosen nothing. E-mails, which no browser is near, use the chosen zone or UTC.
 */
export const browserZoneCookie = "rhizo-time-zone";
