import type { AuditAction } from '@dialsheet/common';
import { Column, CreateDateColumn, Entity, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from 'typeorm';
import { UserEntity } from '../users/user.entity';

/** Append-only: a database trigger rejects UPDATE, DELETE and TRUNCATE on this table. */
@Entity('audit_entries')
export class AuditEntryEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  /** Filled by the bigserial default; pg returns bigint as a string. */
  @Column({ type: 'bigint', insert: false, update: false })
  seq: string;

  @Column({ type: 'uuid', nullable: true })
  campaignId: string | null;

  @Column({ type: 'uuid', nullable: true })
  actorId: string | null;

  @ManyToOne(() => UserEntity, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'actor_id' })
  actor?: UserEntity | null;

  @Column({ type: 'text' })
  entityType: string;

  @Column({ type: 'uuid' })
  entityId: string;

  @Column({ type: 'text' })
  action: AuditAction;

  @Column({ type: 'jsonb', nullable: true })
  before: Record<string, unknown> | null;

  @Column({ type: 'jsonb', nullable: true })
  after: Record<string, unknown> | null;

  @Column({ type: 'text', nullable: true })
  reason: string | null;

  @CreateDateColumn({ type: 'timestamptz' })
  createdAt: Date;
}
