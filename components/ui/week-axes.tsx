/**
 * The grid and axes of a chart by week (the board's turnaround and headroom charts): weeks along
 * the bottom, the value from 0 to the last of `ticks` up the side. Returned as elements, not as a
 * component of its own, so that the chart finds its axes among its direct children.
 */
import { CartesianGrid, XAxis, YAxis } from "recharts";
import { AXIS_TICK, CHART_GRID } from "./chart-style";

export function weekAxes({
  ticks,
  format,
  width,
}: {
  ticks: number[];
  format: (v: number) => string;
  width: number;
}) {
  return [
    <CartesianGrid key="grid" {...CHART_GRID} />,
    <XAxis key="x" dataKey="label" tick={AXIS_TICK} />,
    <YAxis
      key="y"
      domain={[0, ticks[ticks.length - 1] ?? 1]}
      ticks={ticks}
      tick={AXIS_TICK}
      tickFormatter={format}
      width={width}
    />,
  ];
}
