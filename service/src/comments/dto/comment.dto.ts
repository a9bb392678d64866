import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Type } from 'class-transformer';
import {
  IsIn,
  IsInt,
  IsOptional,
  IsString,
  IsUUID,
  MaxLength,
  MinLength,
  ValidateNested,
} from 'class-validator';
import type {
  CommentAnchor,
  CommentAnchorType,
  CreateCommentBody,
  ReplyBody,
} from '@foldfolio/shared';

export const ANCHOR_TYPES: CommentAnchorType[] = ['version', 'residue', 'figure', 'table-cell'];
export const BODY_MAX = 10000;
const BODY_MSG = `Write a comment of 1 to ${BODY_MAX} characters.`;

export class AnchorDto implements CommentAnchor {
  @ApiProperty({ enum: ANCHOR_TYPES })
  @IsIn(ANCHOR_TYPES, { message: `The anchor type must be one of ${ANCHOR_TYPES.join(', ')}.` })
  type: CommentAnchorType;

  @ApiPropertyOptional()
  @IsOptional()
  @IsUUID('all', { message: 'modelVersionId must be the id of a version of this manuscript.' })
  modelVersionId?: string;

  @IsOptional() @IsString() @MaxLength(8) chain?: string;
  @IsOptional() @Type(() => Number) @IsInt({ message: 'seq must be a whole number.' }) seq?: number;
  @IsOptional() @IsString() @MaxLength(4) icode?: string;
  @IsOptional() @IsString() @MaxLength(60) figureId?: string;
  @IsOptional() @IsString() @MaxLength(60) tableId?: string;
  @IsOptional() @IsString() @MaxLength(40) row?: string;
  @IsOptional() @IsString() @MaxLength(40) column?: string;
}

export class CreateCommentDto implements CreateCommentBody {
  @ApiProperty({ type: AnchorDto })
  @ValidateNested()
  @Type(() => AnchorDto)
  anchor: AnchorDto;

  @ApiProperty({ maxLength: BODY_MAX, description: 'Markdown; @mentions name members' })
  @IsString({ message: BODY_MSG })
  @MinLength(1, { message: BODY_MSG })
  @MaxLength(BODY_MAX, { message: BODY_MSG })
  body: string;
}

export class ReplyDto implements ReplyBody {
  @ApiProperty({ maxLength: BODY_MAX })
  @IsString({ message: BODY_MSG })
  @MinLength(1, { message: BODY_MSG })
  @MaxLength(BODY_MAX, { message: BODY_MSG })
  body: string;
}

export class ListCommentsQuery {
  @ApiPropertyOptional({ description: 'all comments on this version (its residues included)' })
  @IsOptional()
  @IsUUID('all', { message: 'modelVersionId must be the id of a version of this manuscript.' })
  modelVersionId?: string;

  @ApiPropertyOptional({ description: 'exact anchor key, e.g. residue:<version>:A:42:' })
  @IsOptional()
  @IsString()
  @MaxLength(200)
  anchorKey?: string;

  @ApiPropertyOptional({ enum: ['open', 'resolved', 'all'] })
  @IsOptional()
  @IsIn(['open', 'resolved', 'all'], { message: 'status must be open, resolved or all.' })
  status?: 'open' | 'resolved' | 'all';
}
