// ECharts, registered piece by piece (echarts/core) so the Yield route ships only what its
// charts draw. SVG renders crisply in print and in screenshots.
import { BarChart, CustomChart, LineChart } from 'echarts/charts'
import {
  GridComponent,
  LegendComponent,
  MarkLineComponent,
  TooltipComponent,
} from 'echarts/components'
import { use } from 'echarts/core'
import { SVGRenderer } from 'echarts/renderers'

use([
  BarChart,
  CustomChart,
  LineChart,
  GridComponent,
  LegendComponent,
  MarkLineComponent,
  TooltipComponent,
  SVGRenderer,
])

/** Chart colours from the app palette; every series also differs by shape or line style. */
export const CHART = {
  ink: '#1e5f69',
  inkSoft: '#8fafb4',
  amber: '#c98a12',
  danger: '#b93a2b',
  grey: '#5a6a6e',
  line: '#d9ddd6',
  font: "'Roboto Condensed', 'Arial Narrow', sans-serif",
} as const

/** Shared base options: no animation (stable screenshots and print), app font, readable text. */
export const BASE_OPTION = {
  animation: false,
  textStyle: { fontFamily: CHART.font, fontSize: 13, color: '#1b2a2e' },
  tooltip: { trigger: 'axis' as const },
}

/** A percentage for an axis or a tooltip: 0.9234 → "92.3 %". */
export const pct = (v: number | null | undefined, digits = 1) =>
  v === null || v === undefined ? '—' : `${(v * 100).toFixed(digits)} %`
