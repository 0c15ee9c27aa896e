// Types for svg-to-pdfkit 0.1.8 (the package ships none): the options the chart PDF path uses.
declare module 'svg-to-pdfkit' {
  interface SvgToPdfOptions {
    width?: number;
    height?: number;
    preserveAspectRatio?: string;
    useCSS?: boolean;
    assumePt?: boolean;
    precision?: number;
    fontCallback?: (family: string, bold: boolean, italic: boolean, options: { fauxBold?: boolean; fauxItalic?: boolean }) => string;
    imageCallback?: (link: string) => string;
    colorCallback?: (color: [[number, number, number], number]) => [[number, number, number], number];
    warningCallback?: (warning: string) => void;
    documentCallback?: (file: string) => unknown;
  }
  function SVGtoPDF(doc: PDFKit.PDFDocument, svg: string, x?: number, y?: number, options?: SvgToPdfOptions): void;
  export default SVGtoPDF;
}
