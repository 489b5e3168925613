import {
  BarController,
  BarElement,
  CategoryScale,
  Filler,
  Legend,
  LinearScale,
  LineController,
  LineElement,
  LogarithmicScale,
  PointElement,
  Tooltip,
} from 'chart.js';
import { provideCharts } from 'ng2-charts';

/** The app font (DESIGN.md: IBM Plex Sans throughout), for chart.js's own text. */
export const CHART_FONT_FAMILY = "'IBM Plex Sans', system-ui, sans-serif";

/**
 * Provider for components that draw with ng2-charts' `BaseChartDirective`: registers only the
 * chart.js pieces Spincycle's charts use (line and bar charts on category, linear and log
 * axes, filled areas, legend, tooltip), so the rest of chart.js is left out of the bundle, and
 * sets `Chart.defaults.font.family` to the app font. Put it in a component's `providers`.
 */
export function provideSpincycleCharts() {
  return provideCharts({
    registerables: [
      BarController,
      BarElement,
      CategoryScale,
      Filler,
      Legend,
      LinearScale,
      LineController,
      LineElement,
      LogarithmicScale,
      PointElement,
      Tooltip,
    ],
    defaults: { font: { family: CHART_FONT_FAMILY } },
  });
}
