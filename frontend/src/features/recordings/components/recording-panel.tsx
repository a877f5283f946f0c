import { useEffect, useRef, useState, type ReactNode, type Ref } from 'react';
import { Button, Card, Popconfirm, Skeleton, Space } from 'antd';
import { DeleteOutlined, SwapOutlined } from '@ant-design/icons';
import { useQueryClient } from '@tanstack/react-query';
import type { RecordingStatus, SyncMarks } from '@dialsheet/common';
import { EmptyState } from '@/components/feedback/empty-state';
import { ErrorState } from '@/components/feedback/error-state';
import type { FrameInfo, FramePlayerHandle } from '@/components/video/frame-player';
import { useRecording } from '../api/get-recording';
import { useDeleteRecording } from '../api/delete-recording';
import { useUploadRecording } from '../api/upload-recording';
import { ProcessingStatus } from './processing-status';
import { RecordingPlayer } from './recording-player';
import { RecordingUpload } from './recording-upload';

interface RecordingPanelProps {
  runId: string;
  campaignId: string;
  canEdit: boolean;
  sync: SyncMarks | null;
  playerRef?: Ref<FramePlayerHandle>;
  onFrameChange?: (frame: FrameInfo) => void;
  /** Drawn over the playing video's picture, composed by the page. */
  overlay?: ReactNode;
}

/** The run's video: upload it, watch it being processed, then step through it. */
export function RecordingPanel({ runId, campaignId, canEdit, sync, playerRef, onFrameChange, overlay }: RecordingPanelProps) {
  const queryClient = useQueryClient();
  const recording = useRecording({ runId });
  const upload = useUploadRecording(runId);
  const [replaceOpen, setReplaceOpen] = useState(false);
  const remove = useDeleteRecording();
  const current = recording.data ?? null;

  // When processing moves on (or ends), the run and the campaign's run list show a new status.
  const lastStatus = useRef<RecordingStatus | null>(null);
  useEffect(() => {
    const status = current?.status ?? null;
    if (lastStatus.current !== null && status !== lastStatus.current) {
      void queryClient.invalidateQueries({ queryKey: ['runs'] });
    }
    lastStatus.current = status;
  }, [current?.status, queryClient]);

  // Once the new video plays, the finished upload's panel has nothing left to say.
  const uploadPhase = upload.state?.phase;
  const dismissUpload = upload.dismiss;
  useEffect(() => {
    if (uploadPhase === 'done' && current?.status === 'ready') dismissUpload();
  }, [current?.status, dismissUpload, uploadPhase]);

  let body;
  if (recording.isPending) body = <Skeleton active paragraph={{ rows: 6 }} />;
  else if (recording.isError) body = <ErrorState error={recording.error} onRetry={() => void recording.refetch()} />;
  else if (!current) {
    body = canEdit ? (
      <RecordingUpload runId={runId} campaignId={campaignId} replacing={false} />
    ) : (
      <EmptyState title="No video yet" description="A lead or engineer of this campaign uploads the run's video." />
    );
  } else if (current.status === 'ready') {
    body = <RecordingPlayer recording={current} sync={sync} playerRef={playerRef} onFrameChange={onFrameChange} overlay={overlay} />;
  } else {
    body = <ProcessingStatus recording={current} />;
  }

  const showReplace = canEdit && current !== null && (replaceOpen || upload.state !== null || current.status === 'failed');

  return (
    <Card
      size="small"
      className="section-card video-card"
      title="Video"
      extra={
        canEdit && current ? (
          <Space size={4}>
            <Button size="small" icon={<SwapOutlined />} onClick={() => setReplaceOpen((open) => !open)} aria-expanded={showReplace}>
              Replace video
            </Button>
            <Popconfirm
              title="Remove this run's video?"
              description="The file, its playback copy and its frame times are deleted. The audit trail keeps a record."
              okText="Remove video"
              okButtonProps={{ danger: true, loading: remove.isPending }}
              onConfirm={() => remove.mutateAsync({ runId }).catch(() => undefined)}
            >
              <Button size="small" danger icon={<DeleteOutlined />}>
                Remove
              </Button>
            </Popconfirm>
          </Space>
        ) : null
      }
    >
      {body}
      {showReplace ? (
        <div className="replace-area">
          <RecordingUpload runId={runId} campaignId={campaignId} replacing />
        </div>
      ) : null}
    </Card>
  );
}
