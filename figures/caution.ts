/**
 * The caution every projection view, export and e-mail carries, and the draft marking. The app's
 * notice (components/CautionNotice.tsx), the PDFs, the CSVs and the e-mails all read these.
 */
export const CAUTION_TITLE = 'Illustration only';

export const CAUTION_TEXT =
  'These figures are an illustration under stated assumptions. They are not a guarantee and not financial advice; outcomes can be lower. ' +
  "Decisions rest with the trustees, guided by the scheme's own advisers and local regulation.";

/** The draft marking on screen beside results from unapproved assumptions. */
export const DRAFT_NOTE = 'Based on DRAFT assumptions that no trustee has approved.';

/** The draft marking in reports and exports. */
export const DRAFT_TEXT = 'DRAFT: these results use assumptions that no trustee has approved. Do not rely on them for a decision.';
