import { useState, type ReactNode } from 'react';
import { StyleSheet, View } from 'react-native';
import Svg, { Line, Path, Rect, Text as SvgText } from 'react-native-svg';
import { Text } from '@/components/ui';
import { colors, fonts, space } from '@/components/ui/theme';
import { addDays, daysBetween, laterDay } from '@/lib/day-keys';
import { formatDay, formatNumber } from '@/lib/format';
import type { HeadDaysByDay } from '@/lib/grazing/head-days';

// Two small charts drawn with react-native-svg (it renders to <svg> on react-native-web, so the web and a
// native build draw the same): head on the block per day, and forage eaten so far against the grower's
// target take. A day's head-days are that day's average head on the block (head × hours ÷ 24).

export interface LogChartProps {
  byDay: readonly HeadDaysByDay[];
  /** Today at the block, marked on both charts when it falls inside them. */
  today?: string;
  headCount: number;
  startDate: string;
  endDate: string;
  outBy: string;
  eatenLb: number;
  headDaysSoFar: number;
  targetTakeLb: number;
}

const PLOT_H = 110;
const TOP = 14;
const BOTTOM = 20;
const LEFT = 44;
const RIGHT = 8;

function shortDay(key: string) {
  return formatDay(key).replace(/, \d{4}$/, '');
}

/** Axis figures kept short for a phone: 80,000 → "80k". */
function axis(v: number): string {
  return v >= 10_000 ? `${formatNumber(v / 1000)}k` : formatNumber(v);
}

function niceMax(v: number): number {
  if (v <= 0) return 1;
  const mag = 10 ** Math.floor(Math.log10(v));
  for (const m of [1, 1.5, 2, 2.5, 3, 4, 5, 6, 8, 10]) if (m * mag >= v) return m * mag;
  return 10 * mag;
}

function Plot({ width, label, children }: { width: number; label: string; children: ReactNode }) {
  return (
    <View style={styles.plot}>
      <Text variant="label">{label}</Text>
      <Svg width={width} height={TOP + PLOT_H + BOTTOM} aria-hidden>
        {children}
      </Svg>
    </View>
  );
}

export function LogChart({ byDay, today, headCount, startDate, endDate, outBy, eatenLb, headDaysSoFar, targetTakeLb }: LogChartProps) {
  const [width, setWidth] = useState(320);
  const lastLogged = byDay.length ? byDay[byDay.length - 1].date : startDate;
  const first = byDay.length && byDay[0].date < startDate ? byDay[0].date : startDate;
  const last = laterDay(endDate, lastLogged);
  const dayCount = daysBetween(first, last) + 1;
  const innerW = Math.max(40, width - LEFT - RIGHT);
  const slot = innerW / dayCount;
  const x = (key: string) => LEFT + daysBetween(first, key) * slot;
  const baseY = TOP + PLOT_H;

  const headMax = niceMax(Math.max(headCount, ...byDay.map((d) => d.headDays)) * 1.05);
  const yHead = (v: number) => baseY - (v / headMax) * PLOT_H;

  // Cumulative forage eaten at the end of each logged day, at the log's own lb per head-day.
  const lbPerHeadDay = headDaysSoFar > 0 ? eatenLb / headDaysSoFar : 0;
  let running = 0;
  const eatenByDay = byDay.map((d) => ({ date: d.date, lb: (running += d.headDays * lbPerHeadDay) }));
  const lbMax = niceMax(Math.max(targetTakeLb, eatenLb) * 1.1);
  const yLb = (v: number) => baseY - (v / lbMax) * PLOT_H;
  const over = eatenLb > targetTakeLb;
  const line = eatenByDay.length ? `M ${x(eatenByDay[0].date)} ${yLb(0)} ` + eatenByDay.map((p) => `L ${x(p.date) + slot} ${yLb(p.lb)}`).join(' ') : '';

  const outByInRange = outBy >= first && outBy <= last;
  const labelEvery = Math.max(1, Math.ceil(dayCount / Math.max(2, Math.floor(innerW / 56))));
  const xLabels = Array.from({ length: dayCount }, (_, i) => addDays(first, i)).filter((_, i) => i % labelEvery === 0);
  const axisText = { fontSize: 11, fontFamily: fonts.body, fill: colors.inkMuted } as const;

  // Drawn first, under the bars and lines.
  const todayBand =
    today && today >= first && today <= last ? (
      <>
        <Rect x={x(today)} y={TOP} width={slot} height={PLOT_H} fill={colors.skyWash} />
        <SvgText x={x(today) + slot / 2} y={TOP - 3} textAnchor="middle" {...axisText} fill={colors.sky}>
          today
        </SvgText>
      </>
    ) : null;

  const xAxis = (
    <>
      <Line x1={LEFT} y1={baseY} x2={LEFT + innerW} y2={baseY} stroke={colors.lineStrong} strokeWidth={1} />
      {xLabels.map((d) => (
        <SvgText key={d} x={x(d) + slot / 2} y={baseY + 14} textAnchor="middle" {...axisText}>
          {shortDay(d)}
        </SvgText>
      ))}
      {outByInRange ? (
        <>
          <Line x1={x(outBy) + slot} y1={TOP} x2={x(outBy) + slot} y2={baseY} stroke={colors.danger} strokeWidth={1.5} strokeDasharray="3 3" />
          <SvgText x={x(outBy) + slot - 3} y={TOP + 9} textAnchor="end" {...axisText} fill={colors.danger}>
            out by
          </SvgText>
        </>
      ) : null}
    </>
  );

  const summary =
    `Head on the block per day, ${shortDay(first)} to ${shortDay(last)}: ` +
    (byDay.length ? byDay.map((d) => `${shortDay(d.date)} ${formatNumber(d.headDays)}`).join(', ') : 'nothing logged yet') +
    `. Forage eaten ${formatNumber(eatenLb)} lb of the ${formatNumber(targetTakeLb)} lb target take.`;

  return (
    <View style={styles.wrap} role="img" aria-label={summary} onLayout={(e) => setWidth(Math.round(e.nativeEvent.layout.width))} testID="log-chart">
      <Plot width={width} label="Head on the block per day">
        {todayBand}
        <SvgText x={LEFT - 6} y={yHead(headMax) + 4} textAnchor="end" {...axisText}>
          {axis(headMax)}
        </SvgText>
        <SvgText x={LEFT - 6} y={baseY} textAnchor="end" {...axisText}>
          0
        </SvgText>
        {byDay.map((d) => (
          <Rect key={d.date} x={x(d.date) + slot * 0.15} y={yHead(d.headDays)} width={Math.max(1, slot * 0.7)} height={baseY - yHead(d.headDays)} fill={d.date > outBy ? colors.danger : colors.cover} rx={2} />
        ))}
        <Line x1={LEFT} y1={yHead(headCount)} x2={LEFT + innerW} y2={yHead(headCount)} stroke={colors.inkFaint} strokeWidth={1} strokeDasharray="4 4" />
        <SvgText x={LEFT + 4} y={yHead(headCount) - 4} {...axisText}>
          contract {formatNumber(headCount)} head
        </SvgText>
        {xAxis}
      </Plot>
      <Plot width={width} label="Forage eaten so far vs the target take (lb DM)">
        {todayBand}
        <SvgText x={LEFT - 6} y={yLb(lbMax) + 4} textAnchor="end" {...axisText}>
          {axis(lbMax)}
        </SvgText>
        <SvgText x={LEFT - 6} y={baseY} textAnchor="end" {...axisText}>
          0
        </SvgText>
        <Line x1={LEFT} y1={yLb(targetTakeLb)} x2={LEFT + innerW} y2={yLb(targetTakeLb)} stroke={colors.clay} strokeWidth={1.5} strokeDasharray="6 4" />
        <SvgText x={LEFT + 4} y={yLb(targetTakeLb) - 4} {...axisText} fill={colors.clay}>
          target take {formatNumber(targetTakeLb)} lb
        </SvgText>
        {line ? <Path d={line} stroke={over ? colors.danger : colors.cover} strokeWidth={2.5} fill="none" strokeLinejoin="round" /> : null}
        {xAxis}
      </Plot>
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: space.md, width: '100%' },
  plot: { gap: space.xs },
});
