import { type WeatherDay, weatherDaySchema } from '@common/contracts/weather';
import { useMutation } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { useInvalidateTrial } from '@/lib/trial-keys';

export interface WeatherDayInput {
  siteId: string;
  date: string;
  tminC: number | null;
  tmaxC: number | null;
  rainMm: number | null;
}

export const putWeatherDay = (slug: string, { siteId, date, ...body }: WeatherDayInput) =>
  api<WeatherDay>(
    `/api/trials/${encodeURIComponent(slug)}/weather/${siteId}/${date}`,
    weatherDaySchema,
    {
      method: 'PUT',
      body,
    },
  );

/** One day typed in by hand; it changes the season summary and that site's weather. */
export function usePutWeatherDay(slug: string) {
  const invalidate = useInvalidateTrial();
  return useMutation({
    mutationFn: (input: WeatherDayInput) => putWeatherDay(slug, input),
    onSuccess: () => invalidate(slug, 'weather'),
  });
}
