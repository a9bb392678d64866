import { CreateDateColumn, Entity, PrimaryColumn } from 'typeorm';

/** A member who does not want e-mail about one manuscript. */
@Entity('notification_mutes')
export class NotificationMute {
  @PrimaryColumn({ name: 'manuscript_id', type: 'char', length: 36 })
  manuscriptId: string;

  @PrimaryColumn({ name: 'user_id', type: 'char', length: 36 })
  userId: string;

  @CreateDateColumn({ name: 'created_at', type: 'datetime', precision: 3 })
  createdAt: Date;
}
