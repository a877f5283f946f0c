import type { SyncMarks } from '@dialsheet/common';
import { Column, CreateDateColumn, Entity, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';

@Entity('runs')
export class RunEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'uuid' })
  campaignId: string;

  @Column({ type: 'text' })
  name: string;

  /** pg returns a date column as 'YYYY-MM-DD' text, which is exactly the wire form. */
  @Column({ type: 'date', nullable: true })
  runDate: string | null;

  @Column({ type: 'text', default: '' })
  configuration: string;

  @Column({ type: 'text', default: '' })
  operator: string;

  @Column({ type: 'text', default: '' })
  notes: string;

  @Column({ type: 'jsonb', nullable: true })
  sync: SyncMarks | null;

  @Column({ type: 'uuid' })
  createdById: string;

  /** The release holding this run's data; set, nothing on the run may change. */
  @Column({ type: 'uuid', nullable: true })
  lockedReleaseId: string | null;

  @Column({ type: 'integer', nullable: true })
  lockedReleaseNumber: number | null;

  @CreateDateColumn({ type: 'timestamptz' })
  createdAt: Date;

  @UpdateDateColumn({ type: 'timestamptz' })
  updatedAt: Date;
}
