import { Body, Controller, Get, HttpCode, Inject, Post, Req, Res, UseGuards } from '@nestjs/common';
import { ApiBearerAuth, ApiCookieAuth, ApiTags } from '@nestjs/swagger';
import type { Request, Response } from 'express';
import type { SessionDto, UserDto } from '@foldfolio/shared';
import { APP_CONFIG, type AppConfig } from '../config/app-config.js';
import { CurrentUser, Public } from '../common/request-user.js';
import { toUserDto, User } from '../users/user.entity.js';
import { AuthService, type IssuedSession } from './auth.service.js';
import {
  PasswordResetConfirmDto,
  PasswordResetRequestDto,
  RegisterDto,
  SignInDto,
} from './dto/auth.dto.js';
import { SignInLimitGuard } from './sign-in-limit.guard.js';

export const REFRESH_COOKIE = 'ff_refresh';
/** The refresh cookie is only ever sent to the auth routes. */
export const REFRESH_COOKIE_PATH = '/api/auth';

@ApiTags('auth')
@Controller('auth')
export class AuthController {
  constructor(
    private readonly auth: AuthService,
    @Inject(APP_CONFIG) private readonly cfg: AppConfig,
  ) {}

  @Public()
  @UseGuards(SignInLimitGuard)
  @Post('register')
  async register(
    @Body() dto: RegisterDto,
    @Res({ passthrough: true }) res: Response,
  ): Promise<SessionDto> {
    return this.withCookie(res, await this.auth.register(dto));
  }

  @Public()
  @UseGuards(SignInLimitGuard)
  @HttpCode(200)
  @Post('sign-in')
  async signIn(
    @Body() dto: SignInDto,
    @Res({ passthrough: true }) res: Response,
  ): Promise<SessionDto> {
    return this.withCookie(res, await this.auth.signIn(dto));
  }

  @Public()
  @ApiCookieAuth(REFRESH_COOKIE)
  @HttpCode(200)
  @Post('refresh')
  async refresh(
    @Req() req: Request,
    @Res({ passthrough: true }) res: Response,
  ): Promise<SessionDto> {
    try {
      return this.withCookie(res, await this.auth.refresh(this.cookie(req)));
    } catch (err) {
      this.clearCookie(res);
      throw err;
    }
  }

  @Public()
  @HttpCode(204)
  @Post('sign-out')
  async signOut(@Req() req: Request, @Res({ passthrough: true }) res: Response): Promise<void> {
    await this.auth.signOut(this.cookie(req));
    this.clearCookie(res);
  }

  @ApiBearerAuth()
  @Get('me')
  me(@CurrentUser() user: User): UserDto {
    return toUserDto(user);
  }

  @Public()
  @UseGuards(SignInLimitGuard)
  @HttpCode(202)
  @Post('password-reset')
  async requestReset(@Body() dto: PasswordResetRequestDto): Promise<{ message: string }> {
    await this.auth.requestPasswordReset(dto.email);
    return {
      message:
        'If an account uses this address, a reset link is on its way. Check your mail in a minute.',
    };
  }

  @Public()
  @HttpCode(204)
  @Post('password-reset/confirm')
  async confirmReset(@Body() dto: PasswordResetConfirmDto): Promise<void> {
    await this.auth.confirmPasswordReset(dto.token, dto.password);
  }

  private cookie(req: Request): string | undefined {
    const c = (req.cookies as Record<string, unknown> | undefined)?.[REFRESH_COOKIE];
    return typeof c === 'string' ? c : undefined;
  }

  private withCookie(res: Response, issued: IssuedSession): SessionDto {
    res.cookie(REFRESH_COOKIE, issued.refreshCookie, {
      httpOnly: true,
      sameSite: 'strict',
      secure: this.cfg.secureCookies,
      path: REFRESH_COOKIE_PATH,
      expires: issued.refreshExpires,
    });
    return issued.session;
  }

  private clearCookie(res: Response): void {
    res.clearCookie(REFRESH_COOKIE, {
      httpOnly: true,
      sameSite: 'strict',
      secure: this.cfg.secureCookies,
      path: REFRESH_COOKIE_PATH,
    });
  }
}
