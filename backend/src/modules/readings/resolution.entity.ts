import type { ReadingFlag } from '@dialsheet/common';
import { Column, CreateDateColumn, Entity, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';

/** The agreed value of one mismatched cell (sheet, row, channel), with the reason it was chosen. */
@Entity('resolutions')
export class ResolutionEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'uuid' })
  sheetId: string;

  @Column({ type: 'integer' })
  rowIndex: number;

  @Column({ type: 'uuid' })
  channelId: string;

  /** Exactly as the resolver typed it. */
  @Column({ type: 'text' })
  rawText: string;

  @Column({ type: 'float8', nullable: true })
  value: number | null;

  @Column({ type: 'text', nullable: true })
  canonical: string | null;

  @Column({ type: 'text', nullable: true })
  flag: ReadingFlag | null;

  @Column({ type: 'text' })
  reason: string;

  @Column({ type: 'uuid' })
  resolvedBy: string;

  @Column({ type: 'integer' })
  version: number;

  @CreateDateColumn({ type: 'timestamptz' })
  createdAt: Date;

  @UpdateDateColumn({ type: 'timestamptz' })
  updatedAt: Date;
}
