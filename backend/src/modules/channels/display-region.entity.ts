import { Column, Entity, PrimaryColumn } from 'typeorm';

/** Fractions (0–1) of the displayed frame, so a region survives a change of proxy size. */
@Entity('display_regions')
export class DisplayRegionEntity {
  @PrimaryColumn({ type: 'uuid' })
  runId: string;

  @PrimaryColumn({ type: 'uuid' })
  channelId: string;

  @Column({ type: 'float8' })
  x: number;

  @Column({ type: 'float8' })
  y: number;

  @Column({ type: 'float8' })
  width: number;

  @Column({ type: 'float8' })
  height: number;
}
