import { IsOptional, IsUUID } from 'class-validator';

export class LedgerQuery {
  @IsOptional()
  @IsUUID('all', { message: 'against must be the id of another version of this manuscript.' })
  against?: string;
}
