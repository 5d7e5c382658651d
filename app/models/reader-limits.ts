/** Sizes of what readers type about their vehicles, shared by the forms and the server's checks. */
export const NICKNAME_MAX = 40;
export const REPORT_NOTE_MAX = 500;
export const HIDE_REASON_MAX = 300;
