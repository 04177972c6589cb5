/**
 * uPlot and its stylesheet, loaded only when a chart is first shown: the live board has no chart
 * and must start fast on a phone over a site network.
 */
import 'uplot/dist/uPlot.min.css';
export { default } from 'uplot';
