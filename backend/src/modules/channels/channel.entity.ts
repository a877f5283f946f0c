import type { ChannelAccuracy } from '@dialsheet/common';
import { Column, CreateDateColumn, Entity, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';

/** float8 columns, so pg hands back JavaScript numbers rather than numeric strings. */
@Entity('channels')
export class ChannelEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'uuid' })
  campaignId: string;

  @Column({ type: 'text' })
  name: string;

  @Column({ type: 'text' })
  symbol: string;

  @Column({ type: 'text' })
  quantity: string;

  @Column({ type: 'text' })
  rawUnit: string;

  @Column({ type: 'float8' })
  resolution: number;

  @Column({ type: 'float8' })
  rangeMin: number;

  @Column({ type: 'float8' })
  rangeMax: number;

  @Column({ type: 'float8', nullable: true })
  fullScale: number | null;

  @Column({ type: 'float8', nullable: true })
  operatingMin: number | null;

  @Column({ type: 'float8', nullable: true })
  operatingMax: number | null;

  @Column({ type: 'jsonb', nullable: true })
  accuracy: ChannelAccuracy | null;

  @Column({ type: 'float8', nullable: true })
  plausibleMin: number | null;

  @Column({ type: 'float8', nullable: true })
  plausibleMax: number | null;

  @Column({ type: 'integer' })
  position: number;

  @CreateDateColumn({ type: 'timestamptz' })
  createdAt: Date;

  @UpdateDateColumn({ type: 'timestamptz' })
  updatedAt: Date;
}
