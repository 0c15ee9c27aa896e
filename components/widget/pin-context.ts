'use client';

import { createContext } from 'react';

/**
 * The dial values of the view a viewer pinned, for actions inside the widget's footer (E-mail this view sends
 * both views in one PDF). Null when nothing is pinned.
 */
export const PinnedViewContext = createContext<Record<string, number> | null>(null);
