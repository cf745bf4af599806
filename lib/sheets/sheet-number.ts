/** The document number shown everywhere: project code, document type, four-digit serial (PROJ-CALC-0007). */
export function formatSheetNumber(projectCode: string, number: number): string {
  return `${projectCode}-CALC-${String(number).padStart(4, '0')}`;
}
