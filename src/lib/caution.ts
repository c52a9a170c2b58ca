/**
 * The one caution wording, shown wherever settings or commands are about to reach a machine: composer, port
 * forms, field cards, print layouts, share pages and e-mails, and the page footer.
 */
export const MACHINERY_CAUTION =
  "Commands and settings here move real machinery. Work with the machine in a safe state, under your site's lockout procedures and the device's own manual; local codes and licensed practice come first.";
