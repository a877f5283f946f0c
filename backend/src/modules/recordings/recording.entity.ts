import type { RecordingStatus, VideoProbe } from '@dialsheet/common';
import { Column, CreateDateColumn, Entity, PrimaryColumn, UpdateDateColumn, type ValueTransformer } from 'typeorm';

/** pg hands bigint back as a string; file sizes stay far below 2^53. */
const bigintNumber: ValueTransformer = {
  to: (value: number | null | undefined) => value,
  from: (value: string | null) => (value === null ? null : Number(value)),
};

@Entity('recordings')
export class RecordingEntity {
  /** Chosen by the server before the file is stored, since the storage keys contain it. */
  @PrimaryColumn({ type: 'uuid' })
  id: string;

  @Column({ type: 'uuid' })
  runId: string;

  @Column({ type: 'uuid' })
  campaignId: string;

  @Column({ type: 'text' })
  originalName: string;

  @Column({ type: 'bigint', transformer: bigintNumber })
  sizeBytes: number;

  @Column({ type: 'text' })
  sha256: string;

  @Column({ type: 'text' })
  mimeType: string;

  @Column({ type: 'text', default: 'uploaded' })
  status: RecordingStatus;

  @Column({ type: 'real', default: 0 })
  progress: number;

  @Column({ type: 'text', nullable: true })
  failureReason: string | null;

  @Column({ type: 'jsonb', nullable: true })
  probe: VideoProbe | null;

  @Column({ type: 'text' })
  originalKey: string;

  @Column({ type: 'text', nullable: true })
  proxyKey: string | null;

  @Column({ type: 'integer', nullable: true })
  proxyWidth: number | null;

  @Column({ type: 'integer', nullable: true })
  proxyHeight: number | null;

  @Column({ type: 'bigint', nullable: true, transformer: bigintNumber })
  proxySizeBytes: number | null;

  @Column({ type: 'text', nullable: true })
  posterKey: string | null;

  /** The processing attempt that currently holds this recording; see RecordingProcessor. */
  @Column({ type: 'uuid', nullable: true })
  claimId: string | null;

  @Column({ type: 'timestamptz', nullable: true })
  heartbeatAt: Date | null;

  @Column({ type: 'uuid' })
  uploadedById: string;

  @CreateDateColumn({ type: 'timestamptz' })
  createdAt: Date;

  @UpdateDateColumn({ type: 'timestamptz' })
  updatedAt: Date;
}
