import { HttpClient } from '@angular/common/http';
import { computed, inject, Injectable, signal } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { StudioDto, UserDto } from '@shared/api/dto';

/** The signed-in user and their studios, shared by guards, the shell and pages. */
@Injectable({ providedIn: 'root' })
export class AuthStore {
  private readonly http = inject(HttpClient);

  readonly user = signal<UserDto | null>(null);
  readonly studios = signal<StudioDto[]>([]);
  readonly signedIn = computed(() => this.user() !== null);

  /** Loads the session's user (null when signed out); called once at start. */
  async restore(): Promise<void> {
    try {
      const { user } = await firstValueFrom(this.http.get<{ user: UserDto | null }>('/api/auth/me'));
      this.user.set(user);
      if (user) await this.refreshStudios();
    } catch {
      this.user.set(null);
    }
  }

  async signIn(email: string, password: string): Promise<void> {
    const { user } = await firstValueFrom(this.http.post<{ user: UserDto }>('/api/auth/sign-in', { email, password }));
    this.user.set(user);
    await this.refreshStudios();
  }

  /**
   * Starts a sign-up. Returns the server's "check your inbox" message, or null when an invite
   * token for this address let the account be created (and signed in) at once.
   */
  async signUp(displayName: string, email: string, password: string, inviteToken?: string): Promise<string | null> {
    const body = { displayName, email, password, ...(inviteToken ? { inviteToken } : {}) };
    const res = await firstValueFrom(this.http.post<{ user?: UserDto; message?: string }>('/api/auth/sign-up', body));
    if (!res.user) return res.message ?? '';
    this.user.set(res.user);
    this.studios.set([]);
    return null;
  }

  /** Opens a mailed verification link: the account is created (or confirmed) and signed in. */
  async verifyEmail(token: string): Promise<void> {
    const { user } = await firstValueFrom(this.http.post<{ user: UserDto }>('/api/auth/verify-email', { token }));
    this.user.set(user);
    await this.refreshStudios();
  }

  /** Mails a new confirmation link to the signed-in account. */
  async resendVerification(): Promise<string> {
    return (await firstValueFrom(this.http.post<{ message: string }>('/api/auth/verify-email/resend', {}))).message;
  }

  async signOut(): Promise<void> {
    await firstValueFrom(this.http.post('/api/auth/sign-out', {}));
    this.user.set(null);
    this.studios.set([]);
  }

  /** Changes the display name of the signed-in account. */
  async rename(displayName: string): Promise<void> {
    const { user } = await firstValueFrom(this.http.patch<{ user: UserDto }>('/api/auth/me', { displayName }));
    this.user.set(user);
  }

  /** Changes the password; the server ends the account's other sessions. Returns its message. */
  async changePassword(currentPassword: string, newPassword: string): Promise<string> {
    return (await firstValueFrom(this.http.post<{ message: string }>('/api/auth/password', { currentPassword, newPassword }))).message;
  }

  /** Mails a reset link (the answer reads the same whether or not the address has an account). */
  async requestPasswordReset(email: string): Promise<string> {
    return (await firstValueFrom(this.http.post<{ message: string }>('/api/auth/password-reset', { email }))).message;
  }

  /** Whether a reset link still works. */
  async passwordResetLink(token: string): Promise<{ valid: boolean }> {
    return firstValueFrom(this.http.get<{ valid: boolean }>(`/api/auth/password-reset/${encodeURIComponent(token)}`));
  }

  async confirmPasswordReset(token: string, password: string): Promise<string> {
    return (await firstValueFrom(this.http.post<{ message: string }>('/api/auth/password-reset/confirm', { token, password }))).message;
  }

  async refreshStudios(): Promise<StudioDto[]> {
    const { studios } = await firstValueFrom(this.http.get<{ studios: StudioDto[] }>('/api/studios'));
    this.studios.set(studios);
    return studios;
  }

  /** The studio to open after sign-in: the last used one if still a member, else the first. */
  preferredStudio(): StudioDto | undefined {
    const last = localStorage.getItem('emberline.lastStudio');
    return this.studios().find((s) => s.id === last) ?? this.studios()[0];
  }

  /** Remembers the studio as the last used one, and as one this browser has worked in. */
  rememberStudio(id: string): void {
    localStorage.setItem('emberline.lastStudio', id);
    const opened = this.openedStudios().filter((s) => s !== id);
    localStorage.setItem('emberline.openedStudios', JSON.stringify([id, ...opened].slice(0, 50)));
  }

  /** Whether this browser has worked in the studio before (so a "not found" now means the membership ended). */
  wasMemberOf(id: string): boolean {
    return this.openedStudios().includes(id);
  }

  private openedStudios(): string[] {
    try {
      const list = JSON.parse(localStorage.getItem('emberline.openedStudios') ?? '[]');
      return Array.isArray(list) ? list.filter((s): s is string => typeof s === 'string') : [];
    } catch {
      return [];
    }
  }
}
