/** Account rules shown in the forms and applied by the server. */

/** How long the link that confirms a new account's address works, hours. */
export const CONFIRM_LINK_HOURS = 24;
