import { App, Typography, Upload } from 'antd';
import { InboxOutlined } from '@ant-design/icons';
import { useUploadRecording } from '../api/upload-recording';
import { UploadProgress } from './upload-progress';

interface RecordingUploadProps {
  runId: string;
  campaignId: string;
  /** The run already has a video: a new file replaces it, after a confirmation. */
  replacing: boolean;
}

/** Drop or pick the run's video; the upload keeps going while you look around the app. */
export function RecordingUpload({ runId, campaignId, replacing }: RecordingUploadProps) {
  const { modal } = App.useApp();
  const { state, start, cancel, dismiss } = useUploadRecording(runId);
  const active = state?.phase === 'uploading' || state?.phase === 'finishing';

  const confirmReplace = (fileName: string) =>
    new Promise<boolean>((resolve) => {
      modal.confirm({
        title: 'Replace the video of this run?',
        content: `${fileName} becomes the run's recording. The current video, its playback copy and its frame times are removed once the new file is stored. The audit trail keeps a record of both.`,
        okText: 'Replace video',
        okButtonProps: { danger: true },
        cancelText: 'Keep the current video',
        onOk: () => resolve(true),
        onCancel: () => resolve(false),
      });
    });

  return (
    <div className="recording-upload">
      {state ? <UploadProgress state={state} campaignId={campaignId} onCancel={cancel} onDismiss={dismiss} /> : null}
      {!active ? (
        <Upload.Dragger
          name="file"
          multiple={false}
          showUploadList={false}
          className={replacing ? 'recording-dragger is-compact' : 'recording-dragger'}
          beforeUpload={async (file) => (replacing ? confirmReplace(file.name) : true)}
          customRequest={({ file, onProgress, onSuccess, onError }) => {
            // Our own progress panel shows the upload; antd's callbacks only keep its bookkeeping right.
            void start(file as File).then((recording) => {
              if (recording) {
                onProgress?.({ percent: 100 });
                onSuccess?.(recording);
              } else {
                onError?.(new Error('upload did not complete'));
              }
            });
          }}
        >
          <p className="ant-upload-drag-icon">
            <InboxOutlined />
          </p>
          <p className="ant-upload-text">{replacing ? 'Drop a file here to replace the video' : 'Drop the run’s video here, or click to choose it'}</p>
          <Typography.Paragraph type="secondary" className="ant-upload-hint">
            MP4, MOV, MKV or WebM straight from the camera or phone, as large as it is. The file is checked from its
            contents, fingerprinted (SHA-256) and never changed; a playback copy is made for stepping.
          </Typography.Paragraph>
        </Upload.Dragger>
      ) : null}
    </div>
  );
}
