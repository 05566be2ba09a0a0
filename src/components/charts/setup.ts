// The ECharts parts Spinwright's charts use, registered once. Importing from echarts/core keeps
// the bundle to these modules instead of the whole library.
import { use, type ComposeOption } from 'echarts/core'
import { LineChart, ScatterChart, type LineSeriesOption, type ScatterSeriesOption } from 'echarts/charts'
import {
  GridComponent,
  LegendComponent,
  MarkPointComponent,
  TooltipComponent,
  type GridComponentOption,
  type LegendComponentOption,
  type MarkPointComponentOption,
  type TooltipComponentOption,
} from 'echarts/components'
import { SVGRenderer } from 'echarts/renderers'

use([LineChart, ScatterChart, GridComponent, TooltipComponent, LegendComponent, MarkPointComponent, SVGRenderer])

export type ChartOption = ComposeOption<
  LineSeriesOption | ScatterSeriesOption | GridComponentOption | TooltipComponentOption | LegendComponentOption | MarkPointComponentOption
>
export type { LineSeriesOption, ScatterSeriesOption }
