export { WidgetView, type WidgetViewProps, type WidgetConfig, type WidgetBranding, type WidgetVersionInfo, type WidgetPanel } from './widget-view';
export { DialControl, type DialControlProps } from './dial-control';
export { brandColors, normaliseHex, DEFAULT_BRAND, type BrandColors } from '@/lib/core/widget/brand';
export { parseDialInput, initialDialValues, atDefaults, dialText, dialDisplay, type DialSpec } from '@/lib/core/widget/dial-values';
