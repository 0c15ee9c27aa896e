export { WidgetView, type WidgetViewProps, type WidgetConfig, type WidgetBranding, type WidgetVersionInfo, type WidgetPanel } from './widget-view';
export { DialControl, type DialControlProps } from './dial-control';
export { brandColors, normaliseHex, DEFAULT_BRAND, type BrandColors } from './brand';
export { parseDialInput, initialDialValues, atDefaults, dialText, dialDisplay, type DialSpec } from './dial-values';
