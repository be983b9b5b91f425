import type { EstimateStatus } from '../estimate-status';
import type { EstimateInput, EstimateResult } from '../estimating/types';

/** Estimate shapes the API answers and the screens read (the services build them). */

export type EstimateFilters = {
	status?: EstimateStatus;
	siteId?: string;
	text?: string;
	page: number;
	pageSize: number;
};

export type EstimateListItem = {
	id: string;
	status: EstimateStatus;
	siteId: string | null;
	address: string | null;
	customerName: string | null;
	totalCents: number;
	squares: number;
	rateCardVersion: number;
	createdAt: Date;
	updatedAt: Date;
};

export type EstimateDetail = {
	id: string;
	status: EstimateStatus;
	siteId: string | null;
	roofPlanId: string | null;
	site: { address: string; customerName: string } | null;
	rateCard: { id: string; version: number };
	input: EstimateInput;
	result: EstimateResult;
	totalCents: number;
	createdBy: string | null;
	createdAt: Date;
	updatedAt: Date;
};
