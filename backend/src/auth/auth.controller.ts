import { Body, Controller, Get, HttpCode, Patch, Post, Req, Res } from '@nestjs/common';
import { Throttle } from '@nestjs/throttler';
import type { Request, Response } from 'express';
import { Public, SignedIn } from '../core/decorators/access.decorator';
import { CurrentAuth } from '../core/decorators/current-auth.decorator';
import type { AuthContext } from '../core/guards/auth.guard';
import { AUTH_THROTTLE } from '../core/throttle/throttlers';
import { AuthService } from './auth.service';
import { ChangeProfileDto, ForgotPasswordDto, LoginDto, ConfirmRegistrationDto, RegisterFirmDto, ResetPasswordDto } from './dto/auth.dto';
import { MeResponseDto } from './dto/me-response.dto';

@Controller('auth')
export class AuthController {
  constructor(private readonly auth: AuthService) {}

  /** Registers a firm: answers the same for every address; the e-mailed link makes the firm (below). */
  @Public()
  @Throttle(AUTH_THROTTLE)
  @Post('register')
  @HttpCode(202)
  register(@Body() dto: RegisterFirmDto, @Req() req: Request): { message: string } {
    return this.auth.register(dto, req.ip);
  }

  /** The e-mailed link: makes the firm, its first user its owner, and signs them in. */
  @Public()
  @Throttle(AUTH_THROTTLE)
  @Post('register/confirm')
  confirmRegistration(@Body() dto: ConfirmRegistrationDto, @Req() req: Request, @Res({ passthrough: true }) res: Response): Promise<MeResponseDto> {
    return this.auth.confirmRegistration(dto, res, req.ip);
  }

  /** Throttled on failed attempts only (SignInThrottle), so an office behind one address signs in freely. */
  @Public()
  @Post('login')
  @HttpCode(200)
  login(@Body() dto: LoginDto, @Req() req: Request, @Res({ passthrough: true }) res: Response): Promise<MeResponseDto> {
    return this.auth.login(dto, res, req.ip);
  }

  @SignedIn()
  @Post('logout')
  @HttpCode(204)
  logout(@CurrentAuth() auth: AuthContext, @Res({ passthrough: true }) res: Response): Promise<void> {
    return this.auth.logout(auth, res);
  }

  @SignedIn()
  @Get('me')
  me(@CurrentAuth() auth: AuthContext): MeResponseDto {
    return this.auth.me(auth);
  }

  @SignedIn()
  @Patch('me')
  changeProfile(@CurrentAuth() auth: AuthContext, @Body() dto: ChangeProfileDto): Promise<MeResponseDto> {
    return this.auth.changeProfile(auth, dto);
  }

  /** Always 202 with the same body, whether or not the address has an account. */
  @Public()
  @Throttle(AUTH_THROTTLE)
  @Post('forgot-password')
  @HttpCode(202)
  async forgotPassword(@Body() dto: ForgotPasswordDto, @Req() req: Request): Promise<{ message: string }> {
    await this.auth.forgotPassword(dto, req.ip);
    return { message: 'If this address has an account, a link to reset the password is on its way.' };
  }

  @Public()
  @Throttle(AUTH_THROTTLE)
  @Post('reset-password')
  @HttpCode(204)
  resetPassword(@Body() dto: ResetPasswordDto, @Req() req: Request): Promise<void> {
    return this.auth.resetPassword(dto, req.ip);
  }
}
