/** Citations that several dose-finding designs give, written once so they read the same in every report. */
import type { Citation } from "../design.js";

export const STORER_1989: Citation = { key: "Storer 1989", text: "Storer BE. Design and analysis of phase I clinical trials. Biometrics. 1989;45(3):925-937.", doi: "10.2307/2531693" };
export const OQUIGLEY_PEPE_FISHER_1990: Citation = { key: "O'Quigley, Pepe & Fisher 1990", text: "O'Quigley J, Pepe M, Fisher L. Continual reassessment method: a practical design for phase 1 clinical trials in cancer. Biometrics. 1990;46(1):33-48.", doi: "10.2307/2531628" };
export const LEE_CHEUNG_2009: Citation = { key: "Lee & Cheung 2009", text: "Lee SM, Cheung YK. Model calibration in the continual reassessment method. Clinical Trials. 2009;6(3):227-238.", doi: "10.1177/1740774509105076" };
export const LIU_YUAN_2015: Citation = { key: "Liu & Yuan 2015", text: "Liu S, Yuan Y. Bayesian optimal interval designs for phase I clinical trials. Journal of the Royal Statistical Society, Series C (Applied Statistics). 2015;64(3):507-523.", doi: "10.1111/rssc.12089" };
