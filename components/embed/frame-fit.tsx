'use client';

import { useEffect } from 'react';

declare global {
  interface Window {
    iFrameResizer?: { targetOrigin?: string };
  }
}

/**
 * Loads iframe-resizer 4.4.5's child script so the host page can size this frame to its content. Size
 * messages go only to `origin`: the host origin the server checked against the client's allowed origins,
 * and, where the browser tells us (location.ancestorOrigins), the origin of the page actually framing us.
 */
export function FrameFit({ origin }: { origin: string | null }) {
  useEffect(() => {
    if (!origin || window.parent === window) return;
    const ancestors = (window.location as Location & { ancestorOrigins?: DOMStringList }).ancestorOrigins;
    if (ancestors && ancestors.length > 0 && ancestors[0] !== origin) return;
    window.iFrameResizer = { targetOrigin: origin };
    void import('iframe-resizer/js/iframeResizer.contentWindow.js');
  }, [origin]);
  return null;
}
