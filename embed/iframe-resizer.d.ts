// iframe-resizer 4.4.5 ships no types; the loader uses only the parent function.
declare module 'iframe-resizer/js/iframeResizer.js' {
  interface ParentOptions {
    checkOrigin?: boolean | string[];
    heightCalculationMethod?: string;
    warningTimeout?: number;
    log?: boolean;
    scrolling?: boolean | 'omit';
    tolerance?: number;
    minHeight?: number;
    onInit?: (iframe: HTMLIFrameElement) => void;
    onResized?: (data: { iframe: HTMLIFrameElement; height: number; width: number; type: string }) => void;
  }
  const iframeResize: (options: ParentOptions, target: HTMLIFrameElement | string) => HTMLIFrameElement[];
  export default iframeResize;
}

declare module 'iframe-resizer/js/iframeResizer.contentWindow.js';
