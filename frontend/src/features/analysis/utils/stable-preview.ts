// The live preview of a stable value: the same common functions the server runs, on the series it
// sent, so dragging the window needs no round trip. The server's saved result stays the
// authoritative one.
import type {
  CalibrationChain,
  Channel,
  ChannelSeries,
  ChannelSpec,
  StabilityRule,
  StabilityVerdict,
  StableValue,
  TimeWindow,
  TrendPoint,
} from '@dialsheet/common';
import { evaluateStability, stableValue } from './analysis-lib';
import { thrownMessage } from './number-format';

/** The series as fit points in raw display units (engineering units for a derived channel). */
export function rawPoints(series: ChannelSeries): TrendPoint[] {
  const y = series.derived ? series.value : series.raw;
  return series.t.map((t, i) => ({ t, y: y[i], unchecked: series.unchecked[i] }));
}

/** The series in engineering units (what a stability rule judges). */
export function engineeringPoints(series: ChannelSeries): TrendPoint[] {
  return series.t.map((t, i) => ({ t, y: series.value[i], unchecked: series.unchecked[i] }));
}

/** What the uncertainty needs of the channel; a derived channel has no display of its own. */
export function channelSpecFor(series: ChannelSeries, channel: Channel | undefined): ChannelSpec {
  if (series.derived || !channel) return { id: series.channelId, name: series.symbol, rawUnit: series.unit, resolution: 0 };
  return { id: channel.id, name: channel.name, rawUnit: channel.rawUnit, resolution: channel.resolution, fullScale: channel.fullScale, accuracy: channel.accuracy };
}

export interface PreviewInput {
  series: ChannelSeries;
  channel: Channel | undefined;
  calibration: CalibrationChain | null;
  window: TimeWindow;
  tStar: number;
  allowExtrapolation: boolean;
  rule: StabilityRule | null;
}

export interface Preview {
  stable: StableValue | null;
  stability: StabilityVerdict | null;
  /** Why there is no stable value (too few points, t* outside the window…). */
  error: string | null;
  stabilityError: string | null;
  /** t* lies outside the fitted readings and extrapolation is not confirmed. */
  needsExtrapolation: boolean;
  /** Times of the fitted points, in the order of the fit's residuals. */
  windowT: number[];
}

/** The options the preview passes to stableValue (and the save sends as the analysis input). */
export function previewOptions(input: Pick<PreviewInput, 'series' | 'allowExtrapolation'>) {
  return { allowExtrapolation: input.allowExtrapolation, includeResolution: !input.series.derived };
}

export function computePreview(input: PreviewInput): Preview {
  const { series, window, tStar } = input;
  const windowT = series.t.filter((t) => t >= window.from && t <= window.to);
  const inside = windowT.length > 0 && tStar >= windowT[0] && tStar <= windowT[windowT.length - 1];
  const needsExtrapolation = windowT.length >= 3 && !inside && !input.allowExtrapolation;
  let stable: StableValue | null = null;
  let error: string | null = null;
  try {
    stable = stableValue(
      rawPoints(series),
      window,
      tStar,
      channelSpecFor(series, input.channel),
      series.derived ? null : input.calibration,
      previewOptions(input),
    );
  } catch (e) {
    error = thrownMessage(e);
  }
  let stability: StabilityVerdict | null = null;
  let stabilityError: string | null = null;
  if (input.rule) {
    try {
      // The rule's window ends at the chosen time (t*), as the rule defines it.
      stability = evaluateStability(input.rule, engineeringPoints(series), { end: tStar, unit: series.unit });
    } catch (e) {
      stabilityError = thrownMessage(e);
    }
  }
  return { stable, stability, error, stabilityError, needsExtrapolation, windowT };
}
