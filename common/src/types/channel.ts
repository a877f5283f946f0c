// A channel is one instrument display filmed during the runs of a campaign; a display region says
// where that display sits in the frame of one run's video (the camera may move between runs).

/**
 * The instrument's accuracy as its data sheet states it. Any part may be absent; a spec of
 * "0.5 % of reading + 2 digits" is {percentOfReading: 0.5, digits: 2}.
 */
export interface ChannelAccuracy {
  /** Percent of full scale (needs the channel's fullScale to become a number). */
  percentOfFullScale?: number | null;
  /** Percent of the reading itself. */
  percentOfReading?: number | null;
  /** Counts of the last displayed digit (each worth `resolution`). */
  digits?: number | null;
}

export interface Channel {
  id: string;
  campaignId: string;
  name: string;
  /** Short label used in sheet columns and formulas, e.g. "T1". */
  symbol: string;
  /** What the display measures, e.g. "temperature", "voltage", "pressure". */
  quantity: string;
  /** Unit shown on the display, e.g. "°C", "V", "kPa". */
  rawUnit: string;
  /** Step of the last displayed digit (> 0), e.g. 0.1. */
  resolution: number;
  /** Display range, rangeMin < rangeMax. */
  rangeMin: number;
  rangeMax: number;
  /** Full-scale value that "% of full scale" refers to; null when the spec does not use one. */
  fullScale: number | null;
  /** The instrument's rated operating limits; readings outside are flagged. */
  operatingMin: number | null;
  operatingMax: number | null;
  accuracy: ChannelAccuracy | null;
  /** What this rig can plausibly show; readings outside are flagged for a second look. */
  plausibleMin: number | null;
  plausibleMax: number | null;
  /** Order within the campaign, from 0. */
  position: number;
  createdAt: string;
  updatedAt: string;
}

export interface CreateChannelRequest {
  name: string;
  symbol: string;
  quantity: string;
  rawUnit: string;
  resolution: number;
  rangeMin: number;
  rangeMax: number;
  fullScale?: number | null;
  operatingMin?: number | null;
  operatingMax?: number | null;
  accuracy?: ChannelAccuracy | null;
  plausibleMin?: number | null;
  plausibleMax?: number | null;
}

export interface UpdateChannelRequest extends Partial<CreateChannelRequest> {
  /** Optional reason stored in the audit trail. */
  reason?: string;
}

export interface ReorderChannelsRequest {
  /** Every channel of the campaign exactly once, in the new order. */
  channelIds: string[];
}

/** Where one channel's display sits in a run's frame, as fractions (0–1) of the displayed frame. */
export interface DisplayRegion {
  runId: string;
  channelId: string;
  x: number;
  y: number;
  width: number;
  height: number;
}

export interface DisplayRegionInput {
  channelId: string;
  x: number;
  y: number;
  width: number;
  height: number;
}

export interface SetDisplayRegionsRequest {
  /** The run's complete set; channels left out lose their region. */
  regions: DisplayRegionInput[];
  /** Optional reason stored in the audit trail. */
  reason?: string;
}
