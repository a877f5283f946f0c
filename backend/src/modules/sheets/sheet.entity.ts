import { Column, CreateDateColumn, Entity, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';

/** Rows are not stored: they follow from start, end and interval (see sheet-rules.ts). */
@Entity('sheets')
export class SheetEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'uuid' })
  campaignId: string;

  @Column({ type: 'uuid' })
  runId: string;

  @Column({ type: 'text' })
  name: string;

  @Column({ type: 'float8' })
  startTime: number;

  @Column({ type: 'float8' })
  endTime: number;

  @Column({ type: 'float8' })
  interval: number;

  @Column({ type: 'uuid', nullable: true })
  readerId: string | null;

  @Column({ type: 'uuid', nullable: true })
  checkerId: string | null;

  /** Set once by the reader; kept on the sheet rather than derived so a later edit does not reopen it. */
  @Column({ type: 'timestamptz', nullable: true })
  pass1FinishedAt: Date | null;

  /** Set once by the checker; until then pass-1 values stay hidden from the checker. */
  @Column({ type: 'timestamptz', nullable: true })
  pass2FinishedAt: Date | null;

  @CreateDateColumn({ type: 'timestamptz' })
  createdAt: Date;

  @UpdateDateColumn({ type: 'timestamptz' })
  updatedAt: Date;
}
