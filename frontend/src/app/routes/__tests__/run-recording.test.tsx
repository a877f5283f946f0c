import { afterEach, describe, expect, it, vi } from 'vitest';
import type { CampaignRole, Recording, Run, SetSyncRequest } from '@dialsheet/common';
import { findDialog, renderApp, screen, waitFor, within } from '@/testing/test-utils';
import { makeCampaign, makeProbe, makeRecording, makeRun, makeUser } from '@/testing/fixtures';
import { apiError, type StubRequest, type StubRoutes } from '@/testing/fetch-stub';
import { FakeXhr, nextXhr, stubXhr } from '@/testing/fake-xhr';

const campaignId = '10000000-0000-4000-8000-000000000001';
// Each test uses its own run: uploads are kept per run for the whole session, as in the app.
let runCounter = 0;
function nextRunId(): string {
  runCounter += 1;
  return `30000000-0000-4000-8000-${String(runCounter).padStart(12, '0')}`;
}

/** 30 fps frame times as ffprobe prints them. */
const FRAME_TIMES = Array.from({ length: 120 }, (_, k) => Number((k / 30).toFixed(6)));

function renderRun(
  run: Run,
  { roles = ['lead'], recording = null, routes = {} }: { roles?: CampaignRole[]; recording?: StubRoutes[string] | null; routes?: StubRoutes } = {},
) {
  return renderApp(`/campaigns/${campaignId}/runs/${run.id}`, {
    user: makeUser(),
    routes: {
      'GET /api/campaigns': { body: [makeCampaign({ myRoles: roles })] },
      'GET /api/campaigns/:campaignId': { body: makeCampaign({ myRoles: roles }) },
      'GET /api/runs/:runId': { body: run },
      'GET /api/runs/:runId/recording': recording ?? apiError(404, 'This run has no recording yet'),
      'GET /api/campaigns/:campaignId/runs': { body: [run] },
      'GET /api/campaigns/:campaignId/channels': { body: [] },
      // The run page also lists the run's reading sheets, with member names.
      'GET /api/runs/:runId/sheets': { body: [] },
      'GET /api/campaigns/:campaignId/members': { body: [] },
      ...routes,
    },
  });
}

function videoFile(name = 'warm-stream-run2.mp4', size = 1000): File {
  return new File([new Uint8Array(size)], name, { type: 'video/mp4' });
}

async function chooseFile(container: HTMLElement, user: ReturnType<typeof renderApp>['user'], file: File): Promise<void> {
  await screen.findByText(/Drop the run’s video here/);
  const input = container.querySelector<HTMLInputElement>('.recording-dragger input[type="file"]');
  expect(input).not.toBeNull();
  await user.upload(input!, file);
}

afterEach(() => {
  vi.restoreAllMocks();
});

describe('uploading a run video', () => {
  it('shows percent, speed and time left from the upload progress, and cancels on request', async () => {
    stubXhr();
    let clock = 0;
    vi.spyOn(performance, 'now').mockImplementation(() => clock);
    const run = makeRun({ id: nextRunId() });
    const { container, user } = renderRun(run);

    await chooseFile(container, user, videoFile('warm-stream-run2.mp4', 40_000_000));
    const xhr = await nextXhr();
    expect(xhr.method).toBe('POST');
    expect(xhr.url).toBe(`/api/runs/${run.id}/recording`);
    expect(xhr.headers.Authorization).toBe('Bearer test-access-token');
    expect(xhr.body).toBeInstanceOf(FormData);
    expect(((xhr.body as FormData).get('file') as File).name).toBe('warm-stream-run2.mp4');

    clock = 1000;
    xhr.progress(10_000_000, 40_000_000);
    clock = 2000;
    xhr.progress(20_000_000, 40_000_000);

    const panel = await screen.findByText('warm-stream-run2.mp4');
    const progress = panel.closest('.upload-progress') as HTMLElement;
    await waitFor(() => expect(within(progress).getByText('50 %')).toBeInTheDocument());
    // 20 MB in 2 s; 20 MB still to go.
    expect(within(progress).getByText('20.0 MB of 40.0 MB · 10.0 MB/s · 2 s left')).toBeInTheDocument();
    expect(progress).toHaveAttribute('data-upload-percent', '50');

    // The link halves to 5 MB/s: the 3 s window (10 → 30 MB from 1 s to 4 s) follows smoothly.
    clock = 4000;
    xhr.progress(30_000_000, 40_000_000);
    await waitFor(() => expect(within(progress).getByText('75 %')).toBeInTheDocument());
    expect(within(progress).getByText('30.0 MB of 40.0 MB · 6.7 MB/s · 2 s left')).toBeInTheDocument();

    await user.click(within(progress).getByRole('button', { name: 'Cancel upload' }));
    expect(xhr.aborted).toBe(true);
    expect(await screen.findByText('Upload cancelled')).toBeInTheDocument();
    expect(screen.getByText('warm-stream-run2.mp4: nothing was stored.')).toBeInTheDocument();
  });

  it('warns before leaving the page while an upload is going, and not after it ends', async () => {
    stubXhr();
    const run = makeRun({ id: nextRunId() });
    const { container, user } = renderRun(run);
    await chooseFile(container, user, videoFile());
    const xhr = await nextXhr();

    const during = new Event('beforeunload', { cancelable: true });
    window.dispatchEvent(during);
    expect(during.defaultPrevented).toBe(true);

    xhr.respond(413, { statusCode: 413, error: 'Payload Too Large', message: 'The file is larger than the limit of 8 GB' });
    await screen.findByText('The file is larger than the limit of 8 GB');
    const after = new Event('beforeunload', { cancelable: true });
    window.dispatchEvent(after);
    expect(after.defaultPrevented).toBe(false);
  });

  it("shows the server's message for a file over the limit", async () => {
    stubXhr();
    const run = makeRun({ id: nextRunId() });
    const { container, user } = renderRun(run);
    await chooseFile(container, user, videoFile('huge.mp4'));
    const xhr = await nextXhr();
    xhr.progress(1000, 1000);
    xhr.respond(413, { statusCode: 413, error: 'Payload Too Large', message: 'The file is larger than the limit of 8 GB' });

    const alert = (await screen.findByText('The file is larger than the limit of 8 GB')).closest('.ant-alert') as HTMLElement;
    expect(within(alert).getByText('huge.mp4: nothing was stored.')).toBeInTheDocument();
    // The dragger is back for another try.
    expect(screen.getByText(/Drop the run’s video here/)).toBeInTheDocument();
  });

  it('offers a link to the run that already holds the same file', async () => {
    stubXhr();
    const run = makeRun({ id: nextRunId() });
    const { container, user, router } = renderRun(run);
    await chooseFile(container, user, videoFile('copy-of-run1.mp4'));
    const xhr = await nextXhr();
    xhr.respond(409, {
      statusCode: 409,
      error: 'Conflict',
      message: 'This file is already the recording of run Run 1, meter on warm stream',
      duplicateOf: {
        runId: '30000000-0000-4000-8000-0000000000f1',
        runName: 'Run 1, meter on warm stream',
        recordingId: '40000000-0000-4000-8000-0000000000f1',
      },
    });

    expect(await screen.findByText('This file is already the recording of run Run 1, meter on warm stream')).toBeInTheDocument();
    const link = screen.getByRole('link', { name: 'Open run Run 1, meter on warm stream' });
    expect(link).toHaveAttribute('href', `/campaigns/${campaignId}/runs/30000000-0000-4000-8000-0000000000f1`);
    await user.click(link);
    expect(router.state.location.pathname).toBe(`/campaigns/${campaignId}/runs/30000000-0000-4000-8000-0000000000f1`);
  });

  it('asks before replacing an existing video: nothing is sent when the person keeps it, the upload starts when they confirm', async () => {
    stubXhr();
    const run = makeRun({ id: nextRunId(), recording: makeRecording() });
    const { user, container } = renderRun(run, { recording: { body: makeRecording({ runId: run.id }) } });
    await user.click(await screen.findByRole('button', { name: /Replace video/ }));

    await chooseFileInReplaceArea(container, user);
    // antd names a confirmation twice (a hidden title for screen readers and the visible one).
    const [keepPrompt] = await screen.findAllByText('Replace the video of this run?');
    const keepDialog = keepPrompt.closest('.ant-modal') as HTMLElement;
    expect(within(keepDialog).getByText(/second-take\.mp4 becomes the run's recording/)).toBeInTheDocument();
    await user.click(within(keepDialog).getByRole('button', { name: 'Keep the current video' }));
    await new Promise((resolve) => setTimeout(resolve, 100));
    expect(FakeXhr.instances).toHaveLength(0);

    await chooseFileInReplaceArea(container, user);
    await waitFor(() => expect(screen.getAllByText('Replace the video of this run?').length).toBeGreaterThan(2));
    const prompts = screen.getAllByText('Replace the video of this run?');
    const replaceDialog = prompts[prompts.length - 1].closest('.ant-modal') as HTMLElement;
    await user.click(within(replaceDialog).getByRole('button', { name: 'Replace video' }));
    const xhr = await nextXhr();
    expect(xhr.url).toBe(`/api/runs/${run.id}/recording`);
    xhr.respond(201, makeRecording({ id: '40000000-0000-4000-8000-0000000000b2', runId: run.id, status: 'uploaded', probe: null, proxy: null }));
    expect(await screen.findByTestId('processing-step')).toHaveTextContent('Waiting to process');
  });
});

async function chooseFileInReplaceArea(container: HTMLElement, user: ReturnType<typeof renderApp>['user']): Promise<void> {
  await screen.findByText('Drop a file here to replace the video');
  const input = container.querySelector<HTMLInputElement>('.replace-area input[type="file"]');
  expect(input).not.toBeNull();
  await user.upload(input!, videoFile('second-take.mp4'));
}

describe('processing a run video', () => {
  it('follows the live progress and shows why processing failed', async () => {
    const run = makeRun({ id: nextRunId() });
    const answers: Recording[] = [
      makeRecording({ runId: run.id, status: 'transcoding', progress: 42.4, proxy: null }),
      makeRecording({
        runId: run.id,
        status: 'failed',
        progress: 0,
        proxy: null,
        failureReason: 'The video could not be read: the file is damaged or incomplete.',
      }),
    ];
    let asked = 0;
    const { network } = renderRun(run, {
      recording: () => ({ body: answers[Math.min(asked++, answers.length - 1)] }),
    });

    expect(await screen.findByTestId('processing-step')).toHaveTextContent('Making the playback copy');
    const bar = screen.getByRole('progressbar', { name: 'Processing progress' });
    expect(bar).toHaveAttribute('aria-valuenow', '42');
    expect(screen.getAllByText('42 %').length).toBeGreaterThan(0);

    // The page asks again about once a second while processing goes on.
    expect(await screen.findByTestId('failure-reason', {}, { timeout: 5000 })).toHaveTextContent(
      'The video could not be read: the file is damaged or incomplete.',
    );
    expect(screen.getByText('The video could not be processed')).toBeInTheDocument();
    const polls = network.callsTo('GET /api/runs/:runId/recording').length;
    expect(polls).toBeGreaterThanOrEqual(2);
    // Failed is final: no more polling.
    await new Promise((resolve) => setTimeout(resolve, 1500));
    expect(network.callsTo('GET /api/runs/:runId/recording')).toHaveLength(polls);
  });
});

function readyRoutes(recording: Recording): StubRoutes {
  return {
    'POST /api/recordings/:recordingId/media-urls': {
      body: {
        proxyUrl: `/api/media/${recording.id}/proxy?exp=4102444800&sig=abc`,
        originalUrl: `/api/media/${recording.id}/original?exp=4102444800&sig=abc`,
        posterUrl: null,
        expiresAt: '2099-12-31T23:59:59.000Z',
      },
    },
    'GET /api/recordings/:recordingId/frames': { body: { recordingId: recording.id, times: FRAME_TIMES, keyframeTimes: [0] } },
  };
}

describe('a ready run video', () => {
  it('shows a reader the video, facts and sync, but no upload, replace or sync controls', async () => {
    const runId = nextRunId();
    const recording = makeRecording({ runId, probe: makeProbe({ variableFrameRate: true, averageFps: 29.2 }) });
    const run = makeRun({ id: runId, recording, sync: { first: { videoTime: 2, testTime: 0 } } });
    const { container, network, user } = renderRun(run, {
      roles: ['reader', 'checker'],
      recording: { body: recording },
      routes: readyRoutes(recording),
    });

    expect(await screen.findByRole('region', { name: 'Video' })).toBeInTheDocument();
    expect(container.querySelector('video')).not.toBeNull();
    expect(screen.getByTestId('sync-offset')).toHaveTextContent('2.000 s');
    expect(screen.getByText('Only a lead or engineer of this campaign sets the sync.')).toBeInTheDocument();
    expect(screen.getByTestId('recording-sha256')).toHaveTextContent(recording.sha256);
    expect(screen.getByText('variable frame rate')).toBeInTheDocument();
    // At frame 0 (video 0 s) the test time is 2 s before the start mark.
    expect(screen.getByTestId('test-time')).toHaveTextContent('-00:02.000');

    expect(screen.queryByRole('button', { name: /Mark start here/ })).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /Replace video/ })).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /Remove/ })).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /Edit/ })).not.toBeInTheDocument();
    expect(container.querySelector('input[type="file"]')).toBeNull();
    expect(network.unhandled).toEqual([]);

    // The player's keys are listed in the shortcut sheet beside the global ones.
    await user.keyboard('?');
    const sheet = await findDialog('Keyboard shortcuts');
    expect(within(sheet).getByText('Next frame')).toBeInTheDocument();
    expect(within(sheet).getByText('One second back')).toBeInTheDocument();
    expect(within(sheet).getByText('Runs')).toBeInTheDocument();
  });

  it('lets a lead step to a frame and mark the start there, and shows the server refusal inline', async () => {
    const runId = nextRunId();
    const recording = makeRecording({ runId });
    let saved = makeRun({ id: runId, recording });
    let refuseNext = true;
    const { container, user, network } = renderRun(saved, {
      recording: { body: recording },
      routes: {
        ...readyRoutes(recording),
        'GET /api/runs/:runId': () => ({ body: saved }),
        'PUT /api/runs/:runId/sync': ({ body }: StubRequest) => {
          if (refuseNext) {
            refuseNext = false;
            return apiError(400, 'first sync mark videoTime must lie within the video');
          }
          const request = body as SetSyncRequest;
          saved = { ...saved, sync: { first: request.first, ...(request.second ? { second: request.second } : {}) } };
          return { body: saved };
        },
      },
    });

    await screen.findByRole('region', { name: 'Video' });
    const video = container.querySelector('video')!;
    // jsdom has no decoder: the element's finished seek is what reports the first frame on screen.
    video.dispatchEvent(new Event('seeked'));
    await screen.findByRole('button', { name: /Mark start here/ });

    await user.keyboard('{ArrowRight}{ArrowRight}{ArrowRight}');
    await waitFor(() => expect(screen.getByTestId('frame-index')).toHaveTextContent('3'));
    // The element was sent to the middle of frame 3, never its exact start.
    expect(video.currentTime).toBeCloseTo(3.5 / 30, 6);

    await user.click(screen.getByRole('button', { name: /Mark start here/ }));
    expect(await screen.findByText('first sync mark videoTime must lie within the video')).toBeInTheDocument();

    await user.click(screen.getByRole('button', { name: /Mark start here/ }));
    await waitFor(() => expect(screen.getByTestId('sync-offset')).toHaveTextContent('0.100 s'));
    const puts = network.callsTo('PUT /api/runs/:runId/sync');
    expect(puts).toHaveLength(2);
    expect(puts[1].body).toEqual({ first: { videoTime: FRAME_TIMES[3], testTime: 0 }, second: null });
    expect(screen.queryByText('first sync mark videoTime must lie within the video')).not.toBeInTheDocument();
    expect(screen.getByTestId('test-time')).toHaveTextContent('00:00.000');

    // A second mark whose clock reading makes no sense is caught before it is sent.
    await user.keyboard('{Shift>}{ArrowRight}{/Shift}');
    await waitFor(() => expect(screen.getByTestId('frame-index')).toHaveTextContent('33'));
    await user.type(screen.getByLabelText('Test time at the second mark'), '1:00');
    await user.click(screen.getByRole('button', { name: 'Mark second here' }));
    expect(await screen.findByText(/test seconds per video second/)).toBeInTheDocument();
    expect(network.callsTo('PUT /api/runs/:runId/sync')).toHaveLength(2);
  });
});
