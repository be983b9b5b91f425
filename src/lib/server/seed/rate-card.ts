/** Rate cards arrive with the estimating model; until then there is nothing to seed. */
export async function seedRateCard(_companyId: string): Promise<number> {
	return 0;
}
