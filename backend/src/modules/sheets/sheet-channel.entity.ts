import { Column, Entity, PrimaryColumn } from 'typeorm';

/** One channel of a sheet and its place in the entry order. */
@Entity('sheet_channels')
export class SheetChannelEntity {
  @PrimaryColumn({ type: 'uuid' })
  sheetId: string;

  @PrimaryColumn({ type: 'uuid' })
  channelId: string;

  @Column({ type: 'integer' })
  position: number;
}
