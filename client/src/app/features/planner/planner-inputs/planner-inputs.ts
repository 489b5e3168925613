import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { ReactiveFormsModule } from '@angular/forms';
import { MatButtonToggle, MatButtonToggleGroup } from '@angular/material/button-toggle';
import { MatCheckbox } from '@angular/material/checkbox';
import { ErrorStateMatcher, MatOption } from '@angular/material/core';
import { MatError, MatFormField, MatHint, MatLabel, MatSuffix } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatSelect } from '@angular/material/select';
import { type CycleSummary, NODE_BANDS, type TelescopeNode } from '@spincycle/shared/facility/facility-types';
import { DWARF_SEQUENCE } from '@spincycle/shared/science/colour-sequence';
import { GYRO_RELATION_INFO, GYRO_RELATIONS } from '@spincycle/shared/science/gyrochronology';
import { COMPLETENESS_PERCENT_RANGE, type PlannerField } from '../planner-form';
import { FIELD_LABELS, PlannerStore } from '../planner-store';
import { between, FALSE_ALARM_RANGE, MAGNITUDE_RANGE } from '../planner-validation';

/**
 * The planner's inputs: the star, the node and exposure, the detection goal and the sky-window
 * position and cycle. The form lives in the {@link PlannerStore}; every field with a problem is
 * marked at once, with the message under it.
 */
@Component({
  selector: 'app-planner-inputs',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    DecimalPipe,
    MatButtonToggle,
    MatButtonToggleGroup,
    MatCheckbox,
    MatError,
    MatFormField,
    MatHint,
    MatIcon,
    MatInput,
    MatLabel,
    MatOption,
    MatSelect,
    MatSuffix,
    ReactiveFormsModule,
  ],
  templateUrl: './planner-inputs.html',
  styleUrl: './planner-inputs.scss',
})
export class PlannerInputs {
  protected readonly store = inject(PlannerStore);
  protected readonly form = this.store.form;

  protected readonly bands = NODE_BANDS;
  protected readonly relations = GYRO_RELATIONS.map((id) => GYRO_RELATION_INFO[id]);
  protected readonly starTypes = DWARF_SEQUENCE.map((row) => row.spectralType);
  protected readonly completenessRange = COMPLETENESS_PERCENT_RANGE;
  protected readonly completenessHint = `Chance of recovering the period, ${between(COMPLETENESS_PERCENT_RANGE.min, COMPLETENESS_PERCENT_RANGE.max, '%')}; higher costs more visits`;
  protected readonly magnitudeHint = `Catalogue magnitude, ${between(MAGNITUDE_RANGE.min, MAGNITUDE_RANGE.max, 'mag')}`;
  protected readonly falseAlarmHint = `Of the detection, ${between(FALSE_ALARM_RANGE.min, FALSE_ALARM_RANGE.max)} (e.g. 0.01)`;

  /** Error-state matchers reading the store's errors: a field is red exactly when it has a message. */
  protected readonly matcher = this.createMatchers();

  private createMatchers(): Record<PlannerField, ErrorStateMatcher> {
    const matchers = {} as Record<PlannerField, ErrorStateMatcher>;
    for (const field of Object.keys(FIELD_LABELS) as PlannerField[]) {
      matchers[field] = { isErrorState: () => !!this.store.fieldErrors()[field] };
    }
    return matchers;
  }

  protected error(field: PlannerField): string {
    return this.store.fieldErrors()[field] ?? '';
  }

  protected cycleLabel(cycle: CycleSummary): string {
    return `${cycle.code} — ${cycle.title} (campaign ${cycle.campaignStart} to ${cycle.campaignEnd}; call ${cycle.status})`;
  }

  protected nodeLabel(node: TelescopeNode): string {
    return `${node.code} — ${node.name}, ${node.site.name}`;
  }
}
