export { SpreadChart, type SpreadChartProps } from './spread-chart';
export { CumulativeChart, type CumulativeChartProps } from './cumulative-chart';
export { DriversChart, type DriversChartProps } from './drivers-chart';
export { ScatterChart, type ScatterChartProps } from './scatter-chart';
export { ChartFrame, type ChartFrameProps } from './chart-frame';
export { ChartTable, type ChartTableProps, type ChartTableColumn } from './chart-table';
export { SceneSvg } from './scene-svg';
export { downloadPng, downloadSvg, sceneToPngBlob, embeddedFontCss, fileSlug, saveBlob } from './download';
export { useElementWidth } from './use-element-width';
