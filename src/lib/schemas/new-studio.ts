// A new studio, checked in full on the server (the set-up form's action and POST /api/studios):
// the browser's rules (studio.ts) and the country, zone and currency (src/lib/domain/studio-place.ts).
import { z } from 'zod';
import { countryProblem, currencyProblem, timeZoneProblem } from '$lib/domain/studio-place';
import { ruled, studioFormFields } from './studio';

export const newStudioSchema = z.object({
	...studioFormFields,
	country: ruled(countryProblem, 'Choose a country.'),
	timeZone: ruled(timeZoneProblem, 'Choose a time zone.'),
	currency: ruled(currencyProblem, 'Choose a currency.')
});
