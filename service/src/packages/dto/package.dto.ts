import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import {
  ArrayMaxSize,
  ArrayMinSize,
  IsArray,
  IsBoolean,
  IsInt,
  IsOptional,
  IsString,
  IsUUID,
  Max,
  MaxLength,
  Min,
} from 'class-validator';
import type { CreatePackageBody, CreateReviewLinkBody } from '@foldfolio/shared';

export class CreatePackageDto implements CreatePackageBody {
  @ApiProperty({ type: [String] })
  @IsArray({ message: 'modelVersionIds must be a list of version ids.' })
  @ArrayMinSize(1, { message: 'Choose at least one model version for the package.' })
  @ArrayMaxSize(10, { message: 'A package holds at most 10 model versions; choose fewer.' })
  @IsUUID('all', {
    each: true,
    message: 'Each model version id must be the id of a version of this manuscript.',
  })
  modelVersionIds: string[];

  @ApiProperty()
  @IsBoolean({ message: 'includeModel must be true or false.' })
  includeModel: boolean;

  @ApiProperty()
  @IsBoolean({ message: 'anonymise must be true or false.' })
  anonymise: boolean;
}

export class CreateReviewLinkDto implements CreateReviewLinkBody {
  @ApiPropertyOptional()
  @IsOptional()
  @IsString()
  @MaxLength(200, { message: 'Keep the link label under 200 characters.' })
  label?: string;

  @ApiProperty({ minimum: 1, maximum: 90 })
  @IsInt({ message: 'expiresInDays must be a whole number of days.' })
  @Min(1, { message: 'A review link must last at least 1 day.' })
  @Max(90, { message: 'A review link can last at most 90 days; make a new one later if needed.' })
  expiresInDays: number;
}
