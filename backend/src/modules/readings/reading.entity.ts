import type { ReadingFlag, ReadingPass } from '@dialsheet/common';
import { Column, CreateDateColumn, Entity, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';

/** One entry of a cell in one pass; (sheet, row, channel, pass) is unique and is the save key. */
@Entity('readings')
export class ReadingEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'uuid' })
  sheetId: string;

  @Column({ type: 'integer' })
  rowIndex: number;

  @Column({ type: 'uuid' })
  channelId: string;

  @Column({ type: 'smallint' })
  pass: ReadingPass;

  /** Exactly as typed, never normalised. */
  @Column({ type: 'text' })
  rawText: string;

  @Column({ type: 'float8', nullable: true })
  value: number | null;

  /** The parser's exact decimal spelling, so passes compare without binary rounding. */
  @Column({ type: 'text', nullable: true })
  canonical: string | null;

  @Column({ type: 'text', nullable: true })
  flag: ReadingFlag | null;

  @Column({ type: 'float8', nullable: true })
  frameTime: number | null;

  @Column({ type: 'uuid' })
  enteredBy: string;

  @Column({ type: 'integer' })
  version: number;

  @CreateDateColumn({ type: 'timestamptz' })
  createdAt: Date;

  @UpdateDateColumn({ type: 'timestamptz' })
  updatedAt: Date;
}
