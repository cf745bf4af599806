// The cautions every screen that shows results, and every issued PDF, carries (product brief,
// "Cautions to show"). One source for the app and the PDF.
export const CAUTIONS = [
  'Results are not valid for use until independently checked and approved.',
  "Worldsheet does not replace the facility's safety basis, local codes and regulations, the radiation-protection officer or expert, or a licensed engineer's judgement.",
  'It is not for clinical treatment planning.',
] as const;

export const SAFETY_RELATED_CAUTION =
  'Safety-related calculation: it may feed radiation-safety, shielding or interlock decisions. It needs a checker and an approver who are two different people, neither of them its originator.';
