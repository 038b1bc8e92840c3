package org.loopstand.controller.pulsetest;

import java.util.ArrayList;
import java.util.List;
import org.loopstand.controller.pulsetest.analysis.Judgement;
import org.loopstand.controller.pulsetest.analysis.OutputSample;
import org.loopstand.controller.pulsetest.analysis.Refusal;
import org.loopstand.controller.pulsetest.analysis.ResponseJudge;
import org.loopstand.controller.pulsetest.analysis.StepEvidence;
import org.loopstand.controller.pulsetest.analysis.StepMeasurement;
import org.loopstand.controller.pulsetest.analysis.StepResponseAnalyzer;
import org.loopstand.controller.pulsetest.analysis.StepWindow;
import org.loopstand.controller.pulsetest.plan.PlanSettings;
import org.loopstand.controller.pulsetest.plan.TestPlan;
import org.loopstand.controller.pulsetest.programme.ProgrammeStep;
import org.loopstand.protocol.message.AckOutcome;
import org.loopstand.protocol.message.CommandAck;

/** Turns a run's record into measured, judged steps. Pure. */
public final class PulseTestEvaluator {
    private PulseTestEvaluator() {
    }

    public static PulseTestResult evaluate(PulseTestRecord record, TestPlan plan) {
        if (record.programme() == null || record.programmeStartMs() < 0 || record.declaration() == null) {
            return new PulseTestResult(record, List.of(), List.of(), List.of(), PulseTestResult.Verdict.REFUSED);
        }
        PlanSettings s = plan.settings();
        StepResponseAnalyzer analyzer = new StepResponseAnalyzer(s.noiseThresholdMw(), s.averagingS(),
                s.settleBandPct(), s.settleBandMinMw());
        List<OutputSample> own = OwnOutput.of(record);
        List<OutputSample> raw = record.telemetry().stream().filter(TelemetryPoint::good)
                .map(t -> new OutputSample(t.tMs(), t.outputMw())).toList();
        List<StepResult> steps = new ArrayList<>();
        // only the steps that ran to their end (an aborted run is judged on its finished steps only)
        for (StepTiming timing : record.timings()) {
            ProgrammeStep p = record.programme().steps().get(timing.index());
            List<SentPulse> mine = record.pulses().stream().filter(x -> x.stepIndex() == p.index()).toList();
            long start = mine.isEmpty() ? timing.startMs() : mine.get(0).sentMs();
            long reverse = -1;
            if (p.reverseAtOffsetMs() >= 0) {
                reverse = mine.stream().filter(x -> x.direction() != p.direction()).mapToLong(SentPulse::sentMs)
                        .findFirst().orElse(-1);
            }
            double pulseS = mine.stream().mapToLong(SentPulse::durationMs).sum() / 1000.0;
            StepWindow w = new StepWindow(p.label(), p.kind(), p.direction(), start, reverse, timing.endMs(),
                    p.requestedChangeMw(), pulseS);
            List<Refusal> refusals = new ArrayList<>();
            int unanswered = 0;
            for (SentPulse x : mine) {
                CommandAck a = record.acks().get(x.seq());
                if (a == null) {
                    unanswered++;
                } else if (a.outcome() == AckOutcome.REJECTED) {
                    refusals.add(new Refusal(x.seq(), a.reason(), a.detail() == null ? "" : a.detail()));
                }
            }
            steps.add(new StepResult(p.index(), new StepEvidence(w, analyzer.analyze(w, own), analyzer.analyze(w, raw),
                    p.expectedRampMwPerMin(), p.expectedMoveMs() / 1000.0, refusals, unanswered, timing.settleWaitS(),
                    timing.settled())));
        }
        ResponseJudge judge = new ResponseJudge(plan.tolerances(), record.declaration().gainMwPerPulseS(),
                s.noiseThresholdMw());
        List<Judgement> rows = judge.judge(steps.stream().map(StepResult::evidence).toList());
        PulseTestResult.Verdict verdict = record.state() == RunState.FINISHED
                ? (rows.stream().allMatch(Judgement::passed) ? PulseTestResult.Verdict.PASS : PulseTestResult.Verdict.FAIL)
                : PulseTestResult.Verdict.ABORTED;
        return new PulseTestResult(record, steps, rows, ResponseJudge.findings(rows), verdict);
    }
}
