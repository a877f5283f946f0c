import type { ReactNode, Ref } from 'react';
import { Alert, Skeleton } from 'antd';
import type { Recording, SyncMarks } from '@dialsheet/common';
import { ErrorState } from '@/components/feedback/error-state';
import { FramePlayer, type FrameInfo, type FramePlayerHandle } from '@/components/video/frame-player';
import { useMediaUrls } from '../api/get-media-urls';
import { useRecordingFrames } from '../api/get-recording-frames';

interface RecordingPlayerProps {
  recording: Recording;
  sync: SyncMarks | null;
  playerRef?: Ref<FramePlayerHandle>;
  onFrameChange?: (frame: FrameInfo) => void;
  /** Drawn over the picture (see FramePlayer). */
  overlay?: ReactNode;
}

/** Links that expire within this long count as the likely cause of a playback error. */
const NEAR_EXPIRY_MS = 60_000;

/** The playback copy in the frame-stepping player, over short-lived signed links. */
export function RecordingPlayer({ recording, sync, playerRef, onFrameChange, overlay }: RecordingPlayerProps) {
  const media = useMediaUrls({ recordingId: recording.id });
  const frames = useRecordingFrames({ recordingId: recording.id });

  if (media.isPending || frames.isPending) return <Skeleton.Node active className="player-skeleton" />;
  if (media.isError || frames.isError) {
    const error = media.error ?? frames.error;
    return (
      <ErrorState
        error={error}
        title="The video could not be opened"
        onRetry={() => {
          void media.refetch();
          void frames.refetch();
        }}
      />
    );
  }
  if (!media.data.proxyUrl) {
    return <Alert type="warning" showIcon title="The playback copy is missing. Upload the video again to make a new one." />;
  }

  const probe = recording.probe;
  const aspectRatio = recording.proxy
    ? recording.proxy.width / recording.proxy.height
    : probe
      ? probe.displayWidth / probe.displayHeight
      : undefined;
  const expiresAt = media.data.expiresAt;

  return (
    <FramePlayer
      ref={playerRef}
      src={media.data.proxyUrl}
      poster={media.data.posterUrl}
      frameTimes={frames.data.times}
      fallbackFrameDuration={probe && probe.nominalFps > 0 ? 1 / probe.nominalFps : undefined}
      sync={sync}
      aspectRatio={aspectRatio}
      onFrameChange={onFrameChange}
      overlay={overlay}
      onMediaError={() => {
        // An expired link is the one failure new links fix; anything else would only loop.
        if (Date.parse(expiresAt) - Date.now() < NEAR_EXPIRY_MS) void media.refetch();
      }}
    />
  );
}
