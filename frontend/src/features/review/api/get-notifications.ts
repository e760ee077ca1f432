import type { NotificationDto } from '@ampwright/common';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { reviewKeys } from './review-keys';

/** GET /api/notifications: the person's notices, newest first. */
export const getNotifications = (signal?: AbortSignal) => api.get<NotificationDto[]>('/notifications', { signal });

export const notificationsQueryOptions = () =>
  queryOptions({ queryKey: reviewKeys.notifications, queryFn: ({ signal }) => getNotifications(signal), refetchInterval: 30_000 });

export const useNotifications = (enabled: boolean) => useQuery({ ...notificationsQueryOptions(), enabled });
