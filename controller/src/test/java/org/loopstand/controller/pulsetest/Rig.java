package org.loopstand.controller.pulsetest;

import java.nio.file.Path;
import org.loopstand.controller.pulsetest.plan.PlanLimits;
import org.loopstand.controller.pulsetest.plan.TestPlan;
import org.loopstand.controller.pulsetest.plan.TestPlanLoader;
import org.loopstand.controller.pulsetest.safety.AbortSwitch;
import org.loopstand.protocol.time.VirtualClock;
import org.loopstand.protocol.topic.TopicTree;

/** A model unit and the runner on one direct bus with a virtual clock, stepped in 100 ms. */
final class Rig {
    static final Path PLANS = Path.of("..", "config", "plans");
    static final long STEP_MS = 100;

    final VirtualClock clock = new VirtualClock(1_767_225_600_000L);
    final DirectBus.Broker broker = new DirectBus.Broker();
    final DirectBus runnerBus = new DirectBus(broker, "pulse-test");
    final TopicTree topics = TopicTree.forSite("rig-site");
    final ModelUnit unit;
    final TestPlan plan;
    PulseTestRunner runner;

    Rig(String planFile, double rampMwPerMin, double pulseRateMwPerMin, long deadTimeMs) {
        plan = TestPlanLoader.load(PLANS.resolve(planFile));
        unit = new ModelUnit(new DirectBus(broker, "unit"), clock, topics, "unit-a", 300, 200, 400, rampMwPerMin,
                pulseRateMwPerMin, deadTimeMs, 1000);
    }

    PulseTestRunner runner(PlanLimits caps, AbortSwitch abort) {
        runner = new PulseTestRunner(runnerBus, clock, topics, "unit-a", plan, null, caps, 7, abort, 30);
        return runner;
    }

    /** Runs until the runner is done (bounded), calling {@code each} every step. */
    PulseTestResult run(Runnable each) {
        if (runner == null) {
            runner(plan.limits(), AbortSwitch.NEVER);
        }
        runner.onStart();
        long bound = (long) (plan.limits().maxDurationS() * 1000 / STEP_MS) + 1000;
        for (long i = 0; i < bound && !runner.isDone(); i++) {
            clock.advanceMillis(STEP_MS);
            unit.step();
            runner.doWork();
            each.run();
        }
        runner.onClose();
        return PulseTestEvaluator.evaluate(runner.record(), plan);
    }

    PulseTestResult run() {
        return run(() -> { });
    }
}
