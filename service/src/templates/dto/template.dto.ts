import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Type } from 'class-transformer';
import {
  IsIn,
  IsInt,
  IsObject,
  IsOptional,
  IsString,
  IsUUID,
  Matches,
  Max,
  MaxLength,
  Min,
  MinLength,
} from 'class-validator';

export const BODY_MAX_CHARS = 200_000;
const REF = /^(builtin:[a-z0-9-]{1,60}|[0-9a-f-]{36})@\d{1,6}$/;
const REF_MSG = 'Name a version as <template id>@<number>, for example builtin:torsion-plot@1.';

export class ForkTemplateDto {
  @ApiProperty({ example: 'builtin:torsion-plot@1' })
  @Matches(REF, { message: REF_MSG })
  from: string;

  @ApiProperty({ enum: ['manuscript', 'lab'] })
  @IsIn(['manuscript', 'lab'], { message: 'scope must be manuscript or lab.' })
  scope: 'manuscript' | 'lab';

  @ApiProperty()
  @IsString()
  @MinLength(1, { message: 'Give the template a name of 1 to 120 characters.' })
  @MaxLength(120, { message: 'Give the template a name of 1 to 120 characters.' })
  name: string;

  @ApiPropertyOptional()
  @IsOptional()
  @IsString()
  @MaxLength(500, { message: 'Keep the message under 500 characters.' })
  message?: string;
}

export class SaveVersionDto {
  @ApiProperty()
  @IsString()
  @MinLength(1, { message: 'The template body is empty; write the template before saving.' })
  @MaxLength(BODY_MAX_CHARS, { message: `A template may hold up to ${BODY_MAX_CHARS} characters.` })
  body: string;

  @ApiProperty()
  @IsString()
  @MinLength(1, { message: 'Say in a few words what this version changes (1 to 500 characters).' })
  @MaxLength(500, {
    message: 'Say in a few words what this version changes (1 to 500 characters).',
  })
  message: string;
}

export class PinDto {
  @ApiProperty({ example: 'builtin:torsion-plot@1' })
  @Matches(REF, { message: REF_MSG })
  version: string;
}

export class DiffQueryDto {
  @ApiProperty() @Matches(REF, { message: REF_MSG }) from: string;
  @ApiProperty() @Matches(REF, { message: REF_MSG }) to: string;
}

export class PreviewDto {
  @ApiProperty({ description: 'the slot (built-in id) the draft stands in for' })
  @Matches(/^[a-z0-9-]{1,60}$/, {
    message: 'key must name a built-in template, e.g. torsion-plot.',
  })
  key: string;

  @ApiProperty()
  @IsString()
  @MinLength(1, { message: 'The template body is empty; write the template before previewing.' })
  @MaxLength(BODY_MAX_CHARS, { message: `A template may hold up to ${BODY_MAX_CHARS} characters.` })
  body: string;

  @ApiProperty()
  @IsUUID('all', {
    message: 'modelVersionId must be the id of an analysed version of this manuscript.',
  })
  modelVersionId: string;

  @ApiPropertyOptional()
  @IsOptional()
  @IsIn(['single', 'one-and-half', 'double'], {
    message: 'preset must be single, one-and-half or double.',
  })
  preset?: string;

  @ApiPropertyOptional({
    description: 'the stored template being edited: the draft is numbered as its next version',
  })
  @IsOptional()
  @IsString()
  @MaxLength(80)
  templateId?: string;
}

export class FigureQueryDto {
  @ApiPropertyOptional()
  @IsOptional()
  @IsIn(['single', 'one-and-half', 'double'], {
    message: 'preset must be single, one-and-half or double.',
  })
  preset?: string;

  @ApiPropertyOptional({ description: 'JSON object of template parameters' })
  @IsOptional()
  @IsString()
  @MaxLength(2000, { message: 'params is too long; send only the parameters you change.' })
  params?: string;
}

export class FigureExportQueryDto extends FigureQueryDto {
  @ApiProperty({ enum: ['svg', 'pdf', 'png'] })
  @IsIn(['svg', 'pdf', 'png'], { message: 'format must be svg, pdf or png.' })
  format: 'svg' | 'pdf' | 'png';

  @ApiPropertyOptional()
  @IsOptional()
  @Type(() => Number)
  @IsInt({ message: 'dpi must be a whole number from 36 to 1200.' })
  @Min(36, { message: 'dpi must be a whole number from 36 to 1200.' })
  @Max(1200, { message: 'dpi must be a whole number from 36 to 1200.' })
  dpi?: number;
}

export class TableQueryDto {
  @ApiPropertyOptional({ description: 'table slot (defaults to the one for the method)' })
  @IsOptional()
  @IsIn(['methods-xray', 'methods-em', 'methods-nmr'], {
    message: 'template must be methods-xray, methods-em or methods-nmr.',
  })
  template?: string;
}

export class TableExportQueryDto extends TableQueryDto {
  @ApiProperty({ enum: ['html', 'md', 'tex', 'csv', 'docx'] })
  @IsIn(['html', 'md', 'tex', 'csv', 'docx'], {
    message: 'format must be html, md, tex, csv or docx.',
  })
  format: 'html' | 'md' | 'tex' | 'csv' | 'docx';
}

export class MethodsFormDto {
  @ApiProperty({ description: 'field key → value; null clears a value read from the file' })
  @IsObject({ message: 'values must be an object of field → value.' })
  values: Record<string, string | number | null>;
}
