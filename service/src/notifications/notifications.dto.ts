import { ApiProperty } from '@nestjs/swagger';
import { IsBoolean } from 'class-validator';
import type { NotificationSettingsDto } from '@foldfolio/shared';

export class NotificationSettingsBody implements NotificationSettingsDto {
  @ApiProperty()
  @IsBoolean({ message: 'muted must be true or false.' })
  muted: boolean;
}
