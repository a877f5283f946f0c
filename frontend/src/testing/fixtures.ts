import type { Campaign, CampaignMember, Invitation, Recording, Run, User, VideoProbe } from '@dialsheet/common';

// Wire-shaped objects for component tests; each test overrides only what it is about.
const at = '2026-03-02T09:15:00.000Z';

export function makeUser(overrides: Partial<User> = {}): User {
  return {
    id: '00000000-0000-4000-8000-000000000001',
    email: 'lena.lead@example.org',
    name: 'Lena Lead',
    isAdmin: false,
    createdAt: at,
    ...overrides,
  };
}

export function makeCampaign(overrides: Partial<Campaign> = {}): Campaign {
  return {
    id: '10000000-0000-4000-8000-000000000001',
    name: 'Plate exchanger warm-up series',
    description: 'Warm-up behaviour of a plate exchanger at three flow rates.',
    decimalComma: false,
    status: 'active',
    createdAt: at,
    updatedAt: at,
    myRoles: ['lead'],
    memberCount: 2,
    ...overrides,
  };
}

export function makeMember(overrides: Partial<CampaignMember> = {}): CampaignMember {
  return {
    userId: '00000000-0000-4000-8000-000000000002',
    email: 'rudi.reader@example.org',
    name: 'Rudi Reader',
    roles: ['reader'],
    joinedAt: at,
    ...overrides,
  };
}

export function makeInvitation(overrides: Partial<Invitation> = {}): Invitation {
  return {
    id: '20000000-0000-4000-8000-000000000001',
    campaignId: '10000000-0000-4000-8000-000000000001',
    email: 'new.checker@example.org',
    roles: ['checker'],
    status: 'pending',
    invitedBy: '00000000-0000-4000-8000-000000000001',
    expiresAt: '2026-03-09T09:15:00.000Z',
    createdAt: at,
    ...overrides,
  };
}

export function makeRun(overrides: Partial<Run> = {}): Run {
  return {
    id: '30000000-0000-4000-8000-000000000001',
    campaignId: '10000000-0000-4000-8000-000000000001',
    name: 'Run 1, meter on warm stream',
    runDate: '2026-03-02',
    configuration: 'flow meter on warm stream',
    operator: 'Olga Operator',
    notes: '',
    sync: null,
    recording: null,
    createdAt: at,
    updatedAt: at,
    ...overrides,
  };
}

export function makeProbe(overrides: Partial<VideoProbe> = {}): VideoProbe {
  return {
    durationSec: 4,
    width: 640,
    height: 360,
    displayWidth: 640,
    displayHeight: 360,
    rotation: 0,
    codec: 'h264',
    pixelFormat: 'yuv420p',
    nominalFps: 30,
    averageFps: 30,
    variableFrameRate: false,
    frameCount: 120,
    keyframeCount: 1,
    maxKeyframeInterval: 4,
    creationTime: null,
    container: 'mov,mp4,m4a,3gp,3g2,mj2',
    ...overrides,
  };
}

export function makeRecording(overrides: Partial<Recording> = {}): Recording {
  return {
    id: '40000000-0000-4000-8000-000000000001',
    runId: '30000000-0000-4000-8000-000000000001',
    originalName: 'warm-stream-run1.mp4',
    sizeBytes: 18_651_969,
    sha256: '0348392cff4ca8a6f93fbb0240623a31c011ad92e52d73decd293684d482315b',
    mimeType: 'video/mp4',
    status: 'ready',
    progress: 100,
    failureReason: null,
    probe: makeProbe(),
    proxy: { width: 640, height: 360, sizeBytes: 432_000 },
    createdAt: at,
    uploadedBy: '00000000-0000-4000-8000-000000000001',
    ...overrides,
  };
}
