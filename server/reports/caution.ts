/**
 * The caution wording for PDFs and CSVs. It must read exactly as the app's notice
 * (CAUTION_TEXT in components/CautionNotice.tsx, which imports React Native and so cannot be
 * loaded by the server); tests/unit/statements.test.ts checks the two agree.
 */
export const CAUTION_TEXT =
  'These figures are an illustration under stated assumptions. They are not a guarantee and not financial advice; outcomes can be lower. ' +
  "Decisions rest with the trustees, guided by the scheme's own advisers and local regulation.";

export const DRAFT_TEXT = 'DRAFT: these results use assumptions that no trustee has approved. Do not rely on them for a decision.';
