import { Column, Entity, PrimaryColumn, UpdateDateColumn } from 'typeorm';

/** One row per recording: tens of thousands of times sit better in one array than in rows. */
@Entity('recording_frame_times')
export class RecordingFrameTimesEntity {
  @PrimaryColumn({ type: 'uuid' })
  recordingId: string;

  @Column({ type: 'float8', array: true })
  times: number[];

  @Column({ type: 'float8', array: true })
  keyframeTimes: number[];

  @UpdateDateColumn({ type: 'timestamptz' })
  updatedAt: Date;
}
