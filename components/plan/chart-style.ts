/** Colours and axis styling the Plan tab's recharts charts share (tailwind.config.ts colours, AA on white). */
export const CHART = {
  ink: '#172033',
  brand: '#1f5f8b',
  caution: '#7a4b00',
  grid: '#cbd2dc',
} as const;

export const axisStyle = { tick: { fill: CHART.ink, fontSize: 12 }, stroke: CHART.ink } as const;

/** Props of the x axis of a chart over whole sizes. */
export const sizeAxis = { type: 'number', domain: ['dataMin', 'dataMax'], allowDecimals: false, ...axisStyle } as const;

export const chartMargin = { top: 24, right: 24, bottom: 28, left: 12 } as const;
