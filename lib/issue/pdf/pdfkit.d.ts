// pdfkit ships no types; ./structure.tsx uses the slice of its document it describes itself.
declare module 'pdfkit' {
  const PDFDocument: unknown;
  export default PDFDocument;
}
